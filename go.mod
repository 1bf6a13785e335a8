module github.com/lyacert/lyacert

go 1.26

require (
	github.com/shopspring/decimal v1.6.0
	gonum.org/v1/gonum v0.17.0
)

require (
	github.com/alecthomas/kong v1.17.0
	github.com/willabides/kongplete v0.4.0
)

require (
	github.com/hashicorp/errwrap v1.1.0 // indirect
	github.com/hashicorp/go-multierror v1.1.1 // indirect
	github.com/posener/complete v1.2.3 // indirect
	github.com/riywo/loginshell v0.0.0-20200815045211-7d26008be1ab // indirect
)

require (
	codeberg.org/go-fonts/liberation v0.5.0 // indirect
	codeberg.org/go-latex/latex v0.2.0 // indirect
	codeberg.org/go-pdf/fpdf v0.11.1 // indirect
	git.sr.ht/~sbinet/gg v0.7.0 // indirect
	github.com/ajstarks/svgo v0.0.0-20211024235047-1546f124cd8b // indirect
	github.com/golang/freetype v0.0.0-20170609003504-e2365dfdc4a0 // indirect
	github.com/mitchellh/colorstring v0.0.0-20190213212951-d06e56a500db // indirect
	github.com/rivo/uniseg v0.4.7 // indirect
	github.com/schollz/progressbar/v3 v3.19.1
	golang.org/x/image v0.30.0 // indirect
	golang.org/x/term v0.44.0 // indirect
	golang.org/x/text v0.28.0 // indirect
	gonum.org/v1/plot v0.17.0
)

require (
	github.com/rogpeppe/go-internal v1.16.0
	golang.org/x/sys v0.46.0 // indirect
	golang.org/x/tools v0.36.0 // indirect
)
