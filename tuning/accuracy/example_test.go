package accuracy_test

import (
	"errors"
	"fmt"

	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

func ExampleChoose() {
	scores := []float64{0.1, 0.2, 0.3, 0.35, 0.4, 0.6, 0.7, 0.8, 0.9, 0.95}
	truth := []bool{false, false, false, true, false, false, true, true, false, true}
	const hours = 2.0 // recording time the candidates came from

	th, counts := accuracy.Counts(scores, truth, nil)
	pts := accuracy.Points(th, counts, hours)
	p, _ := accuracy.ParsePolicy("max-false-per-hour=0.5")
	i, _ := accuracy.Choose(pts, p)
	fmt.Printf("%v: threshold %v, sens %.2f, %.1f false/h\n", p, pts[i].Threshold, pts[i].Sens, pts[i].FalsePerHour)

	_, err := accuracy.Choose(pts, accuracy.Policy{Kind: accuracy.MinSensitivity, Value: 1.01})
	var npe *accuracy.NoPointError
	fmt.Println(errors.As(err, &npe), npe.Index)
	// Output:
	// max-false-per-hour=0.5: threshold 0.7, sens 0.75, 0.5 false/h
	// true [7 8 9]
}
