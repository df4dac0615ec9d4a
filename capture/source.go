package capture

// Source yields mono blocks of samples, like io.Reader: Read fills p with up
// to len(p) samples in [-1, 1] and returns how many it wrote. At the end of
// a finite source Read returns io.EOF (possibly after a last short block).
type Source interface {
	SampleRate() float64
	Read(p []float32) (n int, err error)
}
