// Package sweep certifies the equilibria of a model over a grid of
// parameter values and owns the sweep line format in both directions:
// writing lines (Sweep), reading them back (Read), continuing a partial
// output (File.CheckResume, SweepOptions.Resume) and joining the outputs of
// shards (Merge).
//
// # Grid and shards
//
// A Grid is a product of axes, each read from a range "name=lo..hi" and a
// count n of points (--grid r=0..30 --points r=61; ParseGrid), each n exact
// values lo + k·(hi − lo)/(n − 1); point indices run in row-major order (the last
// axis fastest). A grid has at most MaxGridPoints points, checked from the
// axes before anything is allocated. Shard i/N owns the indices k ≡ i
// (mod N); N shards cover the grid exactly once.
//
// # Lines
//
// A sweep writes one JSON line per grid point and equilibrium (one line
// with eq = eqs = 0 where there is no isolated equilibrium), in index
// order, with no times or host names: equal inputs give byte-equal lines,
// and the merged shards of a sweep equal one unsharded run byte for byte.
// Besides the result (SweepLine) every line carries two digests, both
// "sha256:" and 64 hex digits:
//
//   - sweep_digest identifies the sweep: SHA-256 of Identity.Text, which
//     holds the digest of the model's canonical text (model.Canonical: not
//     the path, comments or spacing of the model file), the fixed values,
//     the grid (exact ends and counts), Q and the full check. Lines of one
//     sweep have one sweep digest, whatever shard wrote them; a resume or
//     merge refuses lines with another one. The certificates behind the
//     lines name the model by the same digest, so nothing in the output
//     depends on how the model's path was typed.
//   - line_digest is SHA-256 of the line as written with line_digest empty.
//     Read requires it to match and the line's bytes to be exactly what
//     this package writes for its fields, so a line edited by hand, damaged
//     or truncated in a copy, or pasted from another sweep is refused. The
//     digest holds no secret: whoever edits a line and recomputes its
//     digest is not detected. What a line claims rests on its certificate
//     (certificate_digest), which lyacert verify re-checks from scratch.
//
// Per-line digests, rather than a header line, keep every line
// self-contained: shards merge by copying lines, a partial output is a
// prefix of the complete one, and a line found on its own still says which
// sweep it belongs to.
//
// # Reading back
//
// Read checks every line on its own before anything is derived from its
// numbers (0 ≤ index < of ≤ MaxGridPoints, 0 ≤ eq ≤ eqs ≤ MaxEquilibria,
// known verdict, digest formats, a certificate behind every verdict other
// than undecided), then the file as a whole (one sweep digest, grid size and
// parameter list; the lines of a grid point consecutive and complete). A
// trailing line without its newline or a trailing grid point with lines
// missing is an interrupted write, reported by File.Complete and cut off by
// a resume. Merge allocates nothing from the grid size in the lines: it
// counts the missing points from the points present.
//
// # Writers
//
// LockOutput takes an operating-system lock (flock) on OUT.lock, so that a
// second process writing the same output — a second --resume of a shard
// still running — stops at once with a clear message instead of
// interleaving its lines with the first one's.
package sweep
