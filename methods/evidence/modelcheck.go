package evidence

import (
	"fmt"
	"strings"
)

// ModelCheck is one tripped model check (model.md, "Model checks"): which test,
// on which entry, configuration and span or tap, how surprising it is, the
// likely cause in the trade's words and what to do. methods/checks
// finds them; fusion sets aside the data they condemn and carries each
// into the result document (fuse.Check is this type).
type ModelCheck struct {
	Check  string  `json:"check"`            // e.g. "height-not-linear"
	Entry  string  `json:"entry"`            // the evidence entry's id
	Config string  `json:"config,omitempty"` // configuration, when one
	Where  string  `json:"where,omitempty"`  // span, windows or tap
	PValue float64 `json:"p_value"`          // the check's p-value
	Cause  string  `json:"cause"`            // likely cause, in the trade's words
	Action string  `json:"action"`           // what to do
}

// Line is the check as one readable warning:
//
//	rear-pot, wing-mid, windows above 140 km/h: height-not-linear (p = 0.0004) — likely bump-stop contact or progressive springs; set max_speed_kmh: 140 on rear-pot
func (c ModelCheck) Line() string { return c.Text(c.Check, " — likely ") }

// Text is the check in words: where, the check under the name given, how
// sure (rule-based checks carry no p-value), the likely cause after
// causeSep, and what to do. Line and the report's sentences differ only in
// the name and causeSep.
func (c ModelCheck) Text(name, causeSep string) string {
	msg := c.Place() + ": " + name
	if c.PValue > 0 {
		msg += fmt.Sprintf(" (p = %.2g)", c.PValue)
	}
	if c.Cause != "" {
		msg += causeSep + c.Cause
	}
	if c.Action != "" {
		msg += "; " + c.Action
	}
	return msg
}

// Model check ids (ModelCheck.Check).
const (
	IDHeightNotLinear = "height-not-linear"
	IDWindowResidual  = "window-residual"
	IDTapBlocked      = "tap-blocked"
	IDTapSpeed        = "tap-cp-speed"
	IDTapCpHigh       = "tap-cp-high"
	IDSpeedUnits      = "speed-units"
	IDCLATooLarge     = "cla-too-large"
	IDGainNegative    = "gain-negative"
	IDMirror          = "entry-mirrored"
)

// Place is where the check tripped, in words: "entry, configuration,
// span", each part when known.
func (c ModelCheck) Place() string {
	var at []string
	for _, s := range []string{c.Entry, c.Config, c.Where} {
		if s != "" {
			at = append(at, s)
		}
	}
	return strings.Join(at, ", ")
}
