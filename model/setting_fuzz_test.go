package model

import (
	"testing"
)

// FuzzParseSetting reads arbitrary --set arguments: no panic, and what is
// read is a named exact value that reads back the same when written as
// "name=p/q" (common practice: a parser's output round-trips). The seeds are
// in testdata/fuzz/FuzzParseSetting.
func FuzzParseSetting(f *testing.F) {
	f.Fuzz(func(t *testing.T, s string) {
		st, err := ParseSetting(s)
		if err != nil {
			return
		}
		if st.Name == "" || st.Value == nil {
			t.Fatalf("%q read as %+v", s, st)
		}
		again, err := ParseSetting(st.Name + "=" + st.Value.RatString())
		if err != nil || again.Name != st.Name || again.Value.Cmp(st.Value) != 0 {
			t.Fatalf("%q read as %s=%s, which reads back as %+v (%v)", s, st.Name, st.Value.RatString(), again, err)
		}
	})
}
