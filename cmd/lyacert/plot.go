package main

import (
	"path/filepath"
	"strings"

	"github.com/lyacert/lyacert/certificates"
	"github.com/lyacert/lyacert/report"
)

// sweepCategories maps a grid point's category to the plot's.
var sweepCategories = map[pointCategory]report.SweepCategory{
	catUndecided: report.SweepUndecided,
	catUnstable:  report.SweepUnstable,
	catMixed:     report.SweepMixed,
	catStable:    report.SweepStable,
}

// plotSweep writes report.SweepPlot's drawing of the grid points to path
// (atomically); the file's extension picks the format.
func plotSweep(path, title string, points []gridPoint) error {
	cells := make([]report.SweepCell, len(points))
	for i, p := range points {
		cells[i] = report.SweepCell{Values: p.values, Category: sweepCategories[p.cat]}
	}
	data, err := report.SweepPlot(title, points[0].names, cells, strings.TrimPrefix(strings.ToLower(filepath.Ext(path)), "."))
	if err != nil {
		return err
	}
	return certificates.WriteFileAtomic(path, data, 0o644)
}
