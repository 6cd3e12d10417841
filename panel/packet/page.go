package packet

import (
	_ "embed"
	"encoding/json"
	"strings"
)

var (
	//go:embed assets/review.html
	pageHTML string
	//go:embed assets/review.css
	pageCSS string
	//go:embed assets/review.js
	pageJS string
)

// PageFormat tags the JSON blob inside review.html.
const PageFormat = "quorate-packet"

// pageData is the JSON blob the review page reads. It is the only
// per-packet content of the page, so the leak tests can reason about it.
type pageData struct {
	Format      string        `json:"format"`
	Version     int           `json:"version"`
	Study       string        `json:"study"`
	Packet      string        `json:"packet"`
	Rater       string        `json:"rater"`
	Check       string        `json:"check"`
	Sensitivity float64       `json:"sensitivity"`
	TimeBase    float64       `json:"timeBase"`
	Filters     pageFilters   `json:"filters"`
	Events      int           `json:"events"` // distinct events; len(Items) counts repeats
	Electrodes  []string      `json:"electrodes"`
	Montages    []pageMontage `json:"montages"`
	Items       []pageItem    `json:"items"`
}

type pageFilters struct {
	Low   float64 `json:"low"`
	High  float64 `json:"high"`
	Notch float64 `json:"notch"`
}

type pageMontage struct {
	Name        string      `json:"name"`
	Derivations []pageDeriv `json:"derivations"`
}

type pageDeriv struct {
	Label string `json:"label"`
	Plus  int    `json:"plus"`
	Minus []int  `json:"minus"`
}

type pageItem struct {
	Code    string   `json:"code"`
	Rate    float64  `json:"rate"`
	N       int      `json:"n"` // samples per channel
	EventAt float64  `json:"eventAt"`
	From    float64  `json:"from"` // rated window, seconds from the start
	To      float64  `json:"to"`
	Cond    string   `json:"cond,omitempty"`
	Scale   float64  `json:"scale"`
	Traces  string   `json:"traces"`
	Map     *pageMap `json:"map,omitempty"`
}

type pageMap struct {
	Size       int           `json:"size"`
	Scale      float64       `json:"scale"`
	Values     string        `json:"values"`
	Electrodes []pageMapElec `json:"electrodes"`
}

type pageMapElec struct {
	Name string  `json:"name"`
	X    float64 `json:"x"`
	Y    float64 `json:"y"`
}

// page assembles review.html. encoding/json escapes <, > and & inside
// strings, so no value can close the script element that holds the blob.
func page(d *pageData) ([]byte, error) {
	blob, err := json.Marshal(d)
	if err != nil {
		return nil, err
	}
	r := strings.NewReplacer(
		"/*@CSS@*/", pageCSS,
		"/*@JS@*/", pageJS,
		"@TITLE@", "Rating packet "+d.Packet,
		"@DATA@", string(blob),
	)
	return []byte(r.Replace(pageHTML)), nil
}
