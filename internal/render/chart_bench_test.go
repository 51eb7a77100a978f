package render

import "testing"

// BenchmarkChartSVG draws one golden case's chart in both layouts, the
// SVG alone, into a buffer it reuses as DrawChart does; BenchmarkChartTypes
// is the whole of DrawChart.
func BenchmarkChartSVG(b *testing.B) {
	for _, c := range chartCases(b) {
		ch := c.chart(b)
		b.Run(c.Name, func(b *testing.B) {
			b.ReportAllocs()
			var sc chartScratch
			for b.Loop() {
				series := convertSeries(ch)
				sc.buf = sc.buf[:0]
				for _, l := range []chartLayout{wideChart, narrowChart} {
					if err := appendSVG(&sc, ch, series, l, "chart"); err != nil {
						b.Fatal(err)
					}
				}
			}
		})
	}
}

// BenchmarkChartCSV writes one golden case's chart data as CSV into a
// buffer it reuses, as DrawChart does.
func BenchmarkChartCSV(b *testing.B) {
	for _, c := range chartCases(b) {
		ch := c.chart(b)
		b.Run(c.Name, func(b *testing.B) {
			b.ReportAllocs()
			var buf []byte
			for b.Loop() {
				var err error
				if buf, err = appendChartCSV(buf[:0], ch); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
