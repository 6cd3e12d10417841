package report

import (
	"bytes"
	"fmt"
	"image/color"
	"math"
	"strings"

	"github.com/quorate-eeg/quorate/tuning"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// palette is the Okabe–Ito set, distinguishable with the common colour
// vision deficiencies (Okabe & Ito 2008, Color Universal Design); line
// dashes differ too, so the figures also read in grey.
var palette = []color.RGBA{
	{0x00, 0x72, 0xB2, 255}, // blue
	{0xD5, 0x5E, 0x00, 255}, // vermillion
	{0x00, 0x9E, 0x73, 255}, // bluish green
	{0xCC, 0x79, 0xA7, 255}, // reddish purple
	{0xE6, 0x9F, 0x00, 255}, // orange
	{0x56, 0xB4, 0xE9, 255}, // sky blue
	{0x00, 0x00, 0x00, 255},
}

var dashes = [][]vg.Length{nil, {vg.Points(6), vg.Points(3)}, {vg.Points(2), vg.Points(2)}, {vg.Points(8), vg.Points(2), vg.Points(2), vg.Points(2)}, {vg.Points(4), vg.Points(4)}, {vg.Points(1), vg.Points(3)}}

// svg renders p as an inline <svg> element (no XML prolog).
func svg(p *plot.Plot) (string, error) {
	wt, err := p.WriterTo(14*vg.Centimeter, 10*vg.Centimeter, "svg")
	if err != nil {
		return "", err
	}
	var b bytes.Buffer
	if _, err := wt.WriteTo(&b); err != nil {
		return "", err
	}
	s := b.String()
	if i := strings.Index(s, "<svg"); i >= 0 {
		s = s[i:]
	}
	return s, nil
}

func line(p *plot.Plot, xy plotter.XYs, i int, name string) error {
	l, err := plotter.NewLine(xy)
	if err != nil {
		return err
	}
	l.Color = palette[i%len(palette)]
	l.Dashes = dashes[i%len(dashes)]
	l.Width = vg.Points(1.5)
	p.Add(l)
	if name != "" {
		p.Legend.Add(name, l)
	}
	return nil
}

func rocFrame(title string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.X.Label.Text = "1 − specificity (design-weighted)"
	p.Y.Label.Text = "sensitivity (design-weighted)"
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = 0, 1, 0, 1
	p.Legend.Top = false
	p.Legend.Left = false
	p.Legend.XOffs = -vg.Points(4)
	p.Legend.YOffs = vg.Points(4)
	diag, _ := plotter.NewLine(plotter.XYs{{X: 0, Y: 0}, {X: 1, Y: 1}})
	diag.Color = color.RGBA{0x99, 0x99, 0x99, 255}
	diag.Dashes = []vg.Length{vg.Points(2), vg.Points(2)}
	p.Add(diag)
	return p
}

func finite(xy plotter.XYs) plotter.XYs {
	out := xy[:0:0]
	for _, q := range xy {
		if !math.IsNaN(q.X) && !math.IsNaN(q.Y) && !math.IsInf(q.X, 0) && !math.IsInf(q.Y, 0) {
			out = append(out, q)
		}
	}
	return out
}

// figKROC draws the ROC through the k-of-6 rules (panel majority) and the
// best automatic rule per k.
func figKROC(res *tuning.Result) (string, error) {
	p := rocFrame("Criteria count: at least k of 6")
	xy := plotter.XYs{{X: 0, Y: 0}}
	auto := plotter.XYs{{X: 0, Y: 0}}
	var labels []string
	for i := len(res.KSweep.Rows) - 1; i >= 0; i-- {
		r := res.KSweep.Rows[i]
		xy = append(xy, plotter.XY{X: 1 - r.Weighted.Specificity(), Y: r.Weighted.Sensitivity()})
		labels = append(labels, fmt.Sprintf("k=%d", r.K))
	}
	for i := len(res.Auto.ByK) - 1; i >= 0; i-- {
		w := res.Auto.ByK[i].Weighted
		auto = append(auto, plotter.XY{X: 1 - w.Specificity(), Y: w.Sensitivity()})
	}
	xy = append(xy, plotter.XY{X: 1, Y: 1})
	auto = append(auto, plotter.XY{X: 1, Y: 1})
	if err := line(p, finite(xy), 0, fmt.Sprintf("panel majority criteria (AUC %.2f)", res.KSweep.WeightedAUC)); err != nil {
		return "", err
	}
	if err := line(p, finite(auto), 1, "automatic features at tuned cutoffs"); err != nil {
		return "", err
	}
	lab, err := plotter.NewLabels(plotter.XYLabels{XYs: xy[1 : len(xy)-1], Labels: labels})
	if err == nil {
		for i := range lab.TextStyle {
			lab.TextStyle[i].XAlign = draw.XLeft
		}
		lab.Offset = vg.Point{X: vg.Points(3), Y: -vg.Points(10)}
		p.Add(lab)
	}
	sc, err := plotter.NewScatter(finite(xy[1 : len(xy)-1]))
	if err == nil {
		sc.Color = palette[0]
		p.Add(sc)
	}
	return svg(p)
}

// figCriteria draws the six per-criterion ROC curves.
func figCriteria(res *tuning.Result) (string, error) {
	p := rocFrame("Each feature against the panel for its criterion")
	for j, c := range res.Criteria {
		if c.Skipped != "" || len(c.Curve) == 0 {
			continue
		}
		xy := make(plotter.XYs, 0, len(c.Curve))
		for _, pt := range thin(c.Curve, 400) {
			xy = append(xy, plotter.XY{X: 1 - pt.Weighted.Specificity(), Y: pt.Weighted.Sensitivity()})
		}
		if err := line(p, finite(xy), j, fmt.Sprintf("c%d (AUC %.2f)", c.Criterion, c.AUC.Value)); err != nil {
			return "", err
		}
	}
	return svg(p)
}

// thin keeps at most n points of a curve, always the ends.
func thin(c []tuning.Point, n int) []tuning.Point {
	if len(c) <= n {
		return c
	}
	out := make([]tuning.Point, 0, n+1)
	step := float64(len(c)-1) / float64(n-1)
	for i := range n {
		out = append(out, c[int(math.Round(float64(i)*step))])
	}
	return out
}

// figScore draws sensitivity and PPV against the score threshold.
func figScore(res *tuning.Result) (string, error) {
	p := plot.New()
	p.Title.Text = "Detector score: sensitivity and PPV by threshold"
	p.X.Label.Text = "score threshold"
	p.Y.Label.Text = "proportion (design-weighted)"
	p.Y.Min, p.Y.Max = 0, 1
	p.Legend.Top = true
	var se, ppv plotter.XYs
	for _, pt := range thin(res.Score.Curve, 500) {
		se = append(se, plotter.XY{X: pt.Threshold, Y: pt.Weighted.Sensitivity()})
		ppv = append(ppv, plotter.XY{X: pt.Threshold, Y: pt.Weighted.PPV()})
	}
	if err := line(p, finite(se), 0, "sensitivity"); err != nil {
		return "", err
	}
	if err := line(p, finite(ppv), 1, "PPV"); err != nil {
		return "", err
	}
	return svg(p)
}

// figFPH draws sensitivity against false detections per hour.
func figFPH(res *tuning.Result) (string, error) {
	p := plot.New()
	p.Title.Text = "Detector score: sensitivity against false detections per hour"
	p.X.Label.Text = "false detections per hour of recording (projected to the archive)"
	p.Y.Label.Text = "sensitivity (design-weighted)"
	p.Y.Min, p.Y.Max = 0, 1
	var xy plotter.XYs
	for _, pt := range thin(res.Score.Curve, 500) {
		xy = append(xy, plotter.XY{X: pt.FalsePerHour, Y: pt.Weighted.Sensitivity()})
	}
	xy = finite(xy)
	if len(xy) == 0 {
		return "", nil
	}
	if err := line(p, xy, 2, ""); err != nil {
		return "", err
	}
	return svg(p)
}
