package merge

import (
	"fmt"
	"math"

	"github.com/quorate-eeg/quorate/panel/agreement"
	"github.com/quorate-eeg/quorate/panel/consensus"
)

// Readiness is what a tuning run must say about the panel's work behind its
// reference standard.
type Readiness struct {
	Packets            int     // packets sent out
	OutstandingPackets int     // packets with items still owed
	OwedItems          int     // items with no counted answer
	Events             int     // events in the consensus
	NoQuorum           int     // of which the verdict lacks the quorum
	Quorum             int     // the study's quorum
	VerdictKappa       float64 // Fleiss' kappa of the verdict; NaN when not measured
}

// PanelReadiness gathers the facts from the status, the consensus events and
// the agreement report (nil when there is none).
func PanelReadiness(st Status, events []consensus.Event, agr *consensus.Agreement, quorum int) Readiness {
	r := Readiness{Packets: len(st.Packets), OwedItems: st.Owed, Events: len(events), Quorum: quorum, VerdictKappa: math.NaN()}
	for _, p := range st.Packets {
		if p.Owes > 0 {
			r.OutstandingPackets++
		}
	}
	for _, e := range events {
		if e.Verdict == consensus.NoQuorum.String() {
			r.NoQuorum++
		}
	}
	if agr != nil {
		for _, q := range agr.Questions {
			if q.Question == consensus.Questions[6] {
				r.VerdictKappa = float64(q.Fleiss.Value)
			}
		}
	}
	return r
}

// NoEventReachedQuorum reports whether no event has a panel verdict for lack
// of answers: merge ran, but too few raters have returned.
func (r Readiness) NoEventReachedQuorum() bool { return r.Events > 0 && r.NoQuorum == r.Events }

// Warnings are the sentences a tuning run and its report carry. Slight
// agreement is κ ≤ 0.20 (Landis & Koch 1977, Biometrics 33:159–174).
func (r Readiness) Warnings() []string {
	var w []string
	if r.OutstandingPackets > 0 {
		w = append(w, fmt.Sprintf("%d of %d packets are outstanding (%d items owed): the reference rests on part of the panel", r.OutstandingPackets, r.Packets, r.OwedItems))
	}
	if r.NoQuorum > 0 {
		w = append(w, fmt.Sprintf("%d of %d events lack the quorum of %d answers for a verdict and have no panel reference", r.NoQuorum, r.Events, r.Quorum))
	}
	if band := agreement.LandisKoch(r.VerdictKappa); band == "slight" || band == "poor" {
		w = append(w, fmt.Sprintf("the panel's verdict agreement is %s (Fleiss' kappa %.2f): the reference standard is weak", band, r.VerdictKappa))
	}
	return w
}
