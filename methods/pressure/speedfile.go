package pressure

import (
	"fmt"
	"os"

	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/logs"
)

// speedJoin reads speed from another device's file, joined to the log by
// time (linear interpolation, logs.Interp).
type speedJoin struct {
	ip    *logs.Interp
	file  *os.File
	toKmh func(float64) float64
}

func (j *speedJoin) close() {
	j.ip.Close()
	j.file.Close()
}

// openSpeedFile opens the speed file of log l for the read r of that log,
// whose time is column timeK.
func openSpeedFile(c *campaign.Campaign, l *campaign.LogSpec, r *logs.Reader, timeK int) (*speedJoin, error) {
	sf := l.SpeedFile
	name := c.Path(sf.File)
	f, err := campaign.OpenRegular(name)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	other, err := logs.NewReaderFormat(f, name, sf.SpeedFileColumns(), sf.ReaderFormat())
	if err != nil {
		f.Close()
		return nil, err
	}
	ip := logs.NewInterp(r, timeK, other, 0, 1, sf.OffsetS)
	return &speedJoin{ip: ip, file: f, toKmh: func(x float64) float64 { return air.MsToKmh(sf.SpeedToMs(x)) }}, nil
}
