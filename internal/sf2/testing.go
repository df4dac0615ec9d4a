package sf2

import "testing"

// OpenForTest opens the SoundFont at path for the rest of tb, failing it
// when the file does not open, and closes the file when tb ends.
func OpenForTest(tb testing.TB, path string) *Font {
	tb.Helper()
	f, fh, err := OpenFile(path)
	if err != nil {
		tb.Fatalf("SoundFont %s (FluidR3: Debian package fluid-soundfont-gm): %v", path, err)
	}
	tb.Cleanup(func() { fh.Close() })
	return f
}
