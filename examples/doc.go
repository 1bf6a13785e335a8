// Package examples holds the demo models of lyacert. Every scenario in it is
// invented for illustration and says so in its file.
package examples
