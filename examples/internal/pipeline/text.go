package pipeline

import (
	"fmt"

	"github.com/rolloff/rolloff/filter"
	"github.com/rolloff/rolloff/series"
)

// FormatHz formats a frequency in engineering notation with 4 significant
// figures ("1.101 kHz", "500 Hz").
func FormatHz(f float64) string { return series.Format{Digits: 4}.Value(f, "Hz") }

// MaskText describes a mask in words, for reports.
func MaskText(m filter.Spec) string {
	switch m.Band {
	case filter.Lowpass:
		return fmt.Sprintf("lowpass: pass 0 to %s within %g dB, stop from %s at least %g dB down",
			FormatHz(m.PassHz[0]), m.RippleDB, FormatHz(m.StopHz[0]), m.AttenDB)
	case filter.Highpass:
		return fmt.Sprintf("highpass: pass from %s within %g dB, stop below %s at least %g dB down",
			FormatHz(m.PassHz[0]), m.RippleDB, FormatHz(m.StopHz[0]), m.AttenDB)
	case filter.Bandpass:
		return fmt.Sprintf("bandpass: pass %s to %s within %g dB, stop below %s and above %s at least %g dB down",
			FormatHz(m.PassHz[0]), FormatHz(m.PassHz[1]), m.RippleDB, FormatHz(m.StopHz[0]), FormatHz(m.StopHz[1]), m.AttenDB)
	default:
		return fmt.Sprintf("bandstop: pass below %s and above %s within %g dB, stop %s to %s at least %g dB down",
			FormatHz(m.PassHz[0]), FormatHz(m.PassHz[1]), m.RippleDB, FormatHz(m.StopHz[0]), FormatHz(m.StopHz[1]), m.AttenDB)
	}
}
