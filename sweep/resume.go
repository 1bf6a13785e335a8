package sweep

import (
	"errors"
	"fmt"

	"github.com/lyacert/lyacert/poly"
)

// ErrIncomplete marks an output that lacks grid points: a merge with a shard
// missing or unfinished. The cure is to run (or resume) a shard, not to fix
// the input.
var ErrIncomplete = errors.New("incomplete sweep output")

// CheckResume checks that f, read back from a partial output, was written
// by this sweep (the sweep digest of id) for this shard, and holds the
// shard's first len(f.Blocks) grid points in order with their exact
// parameter values. A sweep continues such a file with Options.Resume =
// len(f.Blocks); it never touches a file that fails the check.
func (f *File) CheckResume(id Identity, grid Grid, shard Shard) error {
	if len(f.Blocks) == 0 {
		return nil
	}
	size, err := grid.Size()
	if err != nil {
		return err
	}
	if d := id.Digest(); f.Sweep != d {
		return fmt.Errorf("%s was not written by this sweep (its sweep digest is %s, this sweep's %s: the model, --set, --grid, --q or --full differ); refusing to touch it", f.Name, f.Sweep, d)
	}
	if f.Of != size {
		return fmt.Errorf("%s: a grid of %d points, this sweep's has %d; refusing to touch it", f.Name, f.Of, size)
	}
	if len(f.Blocks) > shard.Points(size) {
		return fmt.Errorf("%s holds %d grid points, more than shard %d/%d owns; refusing to touch it", f.Name, len(f.Blocks), shard.norm().I, shard.norm().N)
	}
	for j, b := range f.Blocks {
		k := shard.Nth(j)
		if b.Index != k {
			return fmt.Errorf("%s:%d: grid point %d where %d was expected: not written by this sweep's shard %d/%d; refusing to touch it", f.Name, b.Records[0].LineNum, b.Index, k, shard.norm().I, shard.norm().N)
		}
		vals := grid.Values(k)
		p := b.Records[0].Line.Params
		for i, a := range grid {
			if v, ok := p.Get(a.Name); !ok || v != poly.RatString(vals[i]) {
				return fmt.Errorf("%s:%d: grid point %d has other parameter values than this sweep's; refusing to touch it", f.Name, b.Records[0].LineNum, k)
			}
		}
	}
	return nil
}
