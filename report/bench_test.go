package report

import (
	"io"
	"testing"
)

// BenchmarkRender200 measures one pack of a 200-holding portfolio with
// about 500 days of series, A4 (goal: under one second per pack).
func BenchmarkRender200(b *testing.B) {
	doc, meta := fixtureDoc(200), fixtureMeta()
	b.ReportAllocs()
	for b.Loop() {
		if err := Render(io.Discard, doc, meta, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkRender20 is the same for the 20-holding fixture.
func BenchmarkRender20(b *testing.B) {
	doc, meta := fixtureDoc(20), fixtureMeta()
	b.ReportAllocs()
	for b.Loop() {
		if err := Render(io.Discard, doc, meta, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}
