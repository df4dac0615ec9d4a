package rfft

import (
	"math"
	"math/cmplx"
	"math/rand"
	"testing"

	"gonum.org/v1/gonum/dsp/fourier"
)

// The transform is the discrete Fourier transform by its definition,
// X[k] = Σ x[j]·e^{-2πijk/n}, and gonum's dsp/fourier gives the same
// coefficients and the same unnormalised inverse (gonum's documented
// conventions), to rounding.
func TestMatchesTheDefinitionAndGonum(t *testing.T) {
	r := rand.New(rand.NewSource(1))
	for _, n := range []int{8, 16, 32, 64, 128, 256, 4096, 8192, 6144, 12} {
		x := make([]float64, n)
		for i := range x {
			x[i] = r.NormFloat64()
		}
		f := New(n)
		got := f.Coefficients(nil, x)
		want := fourier.NewFFT(n).Coefficients(nil, x)
		scale := math.Sqrt(float64(n))
		for k := range got {
			if n <= 256 {
				var d complex128
				for j, v := range x {
					d += complex(v, 0) * cmplx.Rect(1, -2*math.Pi*float64(j*k%n)/float64(n))
				}
				if cmplx.Abs(got[k]-d) > 1e-12*scale*scale {
					t.Fatalf("n=%d: X[%d] = %v, the definition gives %v", n, k, got[k], d)
				}
			}
			if cmplx.Abs(got[k]-want[k]) > 1e-12*scale {
				t.Fatalf("n=%d: X[%d] = %v, gonum %v", n, k, got[k], want[k])
			}
		}
		back := f.Sequence(nil, got)
		gback := fourier.NewFFT(n).Sequence(nil, want)
		for j := range back {
			if math.Abs(back[j]-float64(n)*x[j]) > 1e-11*float64(n) || math.Abs(back[j]-gback[j]) > 1e-11*float64(n) {
				t.Fatalf("n=%d: inverse [%d] = %g, want %g (gonum %g)", n, j, back[j], float64(n)*x[j], gback[j])
			}
		}
	}
}

// The inverse ignores the imaginary parts at 0 and n/2, as gonum's does.
func TestSequenceIgnoresImaginaryEnds(t *testing.T) {
	n := 64
	c := make([]complex128, n/2+1)
	c[0], c[n/2], c[3] = complex(1, 5), complex(2, -7), complex(0.5, 0.25)
	got := New(n).Sequence(nil, c)
	want := fourier.NewFFT(n).Sequence(nil, c)
	for j := range got {
		if math.Abs(got[j]-want[j]) > 1e-12 {
			t.Fatalf("[%d] = %g, gonum %g", j, got[j], want[j])
		}
	}
}

func benchLen(b *testing.B, n int, gonum bool) {
	x := make([]float64, n)
	for i := range x {
		x[i] = math.Sin(float64(i) * 0.1)
	}
	c := make([]complex128, n/2+1)
	var coef func([]complex128, []float64) []complex128
	if gonum {
		coef = fourier.NewFFT(n).Coefficients
	} else {
		coef = New(n).Coefficients
	}
	b.ReportAllocs()
	for range b.N {
		coef(c, x)
	}
}

// The detector's window (4096 at 48 kHz) and its NSDF's zero-padded
// length: 8192 here, 6144 (2^11·3) when FFTPACK was quick for it.
func BenchmarkRfft4096(b *testing.B)  { benchLen(b, 4096, false) }
func BenchmarkGonum4096(b *testing.B) { benchLen(b, 4096, true) }
func BenchmarkRfft8192(b *testing.B)  { benchLen(b, 8192, false) }
func BenchmarkGonum6144(b *testing.B) { benchLen(b, 6144, true) }
