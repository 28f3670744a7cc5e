package tcc

import (
	"io"
	"testing"
)

// benchmarkRender draws every chart of a study in one format, from a
// fresh atlas each time (chart specs, looks, curves, labels, pixels).
func benchmarkRender(b *testing.B, path string, f Format) {
	t := &testing.T{}
	base := loadAtlas(t, path, nil)
	b.ResetTimer()
	n := 0
	for i := 0; i < b.N; i++ {
		a, err := NewAtlas(base.in)
		if err != nil {
			b.Fatal(err)
		}
		charts := a.Charts()
		n = len(charts)
		for _, c := range charts {
			if err := c.Render(io.Discard, f, Settings{}); err != nil {
				b.Fatal(err)
			}
		}
	}
	b.ReportMetric(float64(n), "charts")
	b.ReportMetric(b.Elapsed().Seconds()/float64(b.N*max(n, 1))*1000, "ms/chart")
}

func BenchmarkSaltmarshPNG(b *testing.B) { benchmarkRender(b, saltmarsh, PNG) }
func BenchmarkSaltmarshSVG(b *testing.B) { benchmarkRender(b, saltmarsh, SVG) }
func BenchmarkKestrelPNG(b *testing.B)   { benchmarkRender(b, kestrelPark, PNG) }
