package sweep

import (
	"bytes"
	"fmt"
	"io"
	"slices"
)

// Merged is the union of the outputs of the shards of one sweep: every grid
// point once, in index order — what one unsharded run writes.
type Merged struct {
	Sweep  string
	Of     int
	Blocks []Block // by index, 0 … Of−1
}

// Merge joins the outputs of the shards of one sweep, read by Read. Every
// file must be complete and carry the same sweep digest and grid size; a
// grid point in two files must have byte-equal lines there. Nothing is
// allocated from the grid size in the lines: a missing point is found from
// the points present. A missing point or an unfinished file gives an error
// wrapping ErrIncomplete.
func Merge(files []*File) (*Merged, error) {
	var m Merged
	var first *File
	byIndex := map[int]Block{}
	for _, f := range files {
		if !f.Complete() {
			return nil, incompletef("%s ends in an interrupted grid point; finish that shard with --resume first", f.Name)
		}
		if len(f.Blocks) == 0 {
			continue
		}
		if first == nil {
			first, m.Sweep, m.Of = f, f.Sweep, f.Of
		}
		switch {
		case f.Sweep != m.Sweep:
			return nil, fmt.Errorf("%s: lines of another sweep than %s (sweep digest %s, not %s): not shards of one sweep", f.Name, first.Name, f.Sweep, m.Sweep)
		case f.Of != m.Of:
			// Equal digests imply equal grids; this is a second line of defence.
			return nil, fmt.Errorf("%s: a grid of %d points, %s has %d: not shards of one sweep", f.Name, f.Of, first.Name, m.Of)
		}
		for _, b := range f.Blocks {
			if prev, ok := byIndex[b.Index]; ok {
				if !slices.EqualFunc(prev.Records, b.Records, func(x, y Record) bool { return bytes.Equal(x.Raw, y.Raw) }) {
					return nil, fmt.Errorf("%s:%d: grid point %d appears twice with different lines", f.Name, b.Records[0].LineNum, b.Index)
				}
				continue
			}
			byIndex[b.Index] = b
		}
	}
	if first == nil {
		return nil, fmt.Errorf("no sweep lines in the files given")
	}
	m.Blocks = make([]Block, 0, len(byIndex))
	for _, b := range byIndex {
		m.Blocks = append(m.Blocks, b)
	}
	slices.SortFunc(m.Blocks, func(a, b Block) int { return a.Index - b.Index })
	if missing := m.Of - len(m.Blocks); missing > 0 {
		firstMissing := len(m.Blocks) // the indices are distinct and below Of
		for i, b := range m.Blocks {
			if b.Index != i {
				firstMissing = i
				break
			}
		}
		return nil, incompletef("incomplete: %d of %d grid points missing (the first is %d); run the shard that owns them, or finish it with --resume", missing, m.Of, firstMissing)
	}
	return &m, nil
}

// WriteTo writes the merged lines, verbatim, in index order.
func (m *Merged) WriteTo(w io.Writer) (int64, error) {
	var n int64
	for _, b := range m.Blocks {
		for _, r := range b.Records {
			k, err := w.Write(r.Raw)
			n += int64(k)
			if err != nil {
				return n, err
			}
		}
	}
	return n, nil
}

// incomplete is an error that is ErrIncomplete with a message of its own.
type incomplete struct{ msg string }

func (e incomplete) Error() string        { return e.msg }
func (e incomplete) Is(target error) bool { return target == ErrIncomplete }

func incompletef(format string, args ...any) error {
	return incomplete{fmt.Sprintf(format, args...)}
}
