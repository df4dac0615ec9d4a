module fifthline

go 1.26.0

require (
	github.com/gdamore/tcell/v2 v2.13.10
	github.com/gordonklaus/portaudio v0.0.0-20250206071425-98a94950218b
	github.com/hajimehoshi/go-mp3 v0.3.4
	github.com/mattn/go-runewidth v0.0.16
	github.com/mewkiz/flac v1.0.14
	github.com/rivo/tview v0.42.0
	golang.org/x/sys v0.50.0
	golang.org/x/term v0.48.0
	gonum.org/v1/gonum v0.17.0
	gonum.org/v1/plot v0.17.0
)

require (
	codeberg.org/go-fonts/liberation v0.5.0 // indirect
	codeberg.org/go-latex/latex v0.2.0 // indirect
	codeberg.org/go-pdf/fpdf v0.11.1 // indirect
	git.sr.ht/~sbinet/gg v0.7.0 // indirect
	github.com/ajstarks/svgo v0.0.0-20211024235047-1546f124cd8b // indirect
	github.com/gdamore/encoding v1.0.1 // indirect
	github.com/golang/freetype v0.0.0-20170609003504-e2365dfdc4a0 // indirect
	github.com/icza/bitio v1.1.0 // indirect
	github.com/lucasb-eyer/go-colorful v1.3.0 // indirect
	github.com/mewkiz/pkg v0.0.0-20250417130911-3f050ff8c56d // indirect
	github.com/mewpkg/term v0.0.0-20241026122259-37a80af23985 // indirect
	github.com/rivo/uniseg v0.4.7 // indirect
	golang.org/x/image v0.30.0 // indirect
	golang.org/x/text v0.31.0 // indirect
)
