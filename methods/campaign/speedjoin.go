package campaign

import (
	"fmt"
	"os"

	"liftfuse/methods/air"
	"liftfuse/methods/logs"
)

// SpeedJoin reads ground speed from another device's file (a log's
// speed_file), joined to the log by time with linear interpolation
// (logs.Interp). Every adapter that reads a log with a speed file uses it.
type SpeedJoin struct {
	ip   *logs.Interp
	file *os.File
	sf   *SpeedFile
}

// JoinSpeed opens the speed file of log l for the read r of that log,
// whose time is column timeK; nil when the log has its own speed column.
func (c *Campaign) JoinSpeed(l *LogSpec, r *logs.Reader, timeK int) (*SpeedJoin, error) {
	sf := l.SpeedFile
	if sf == nil {
		return nil, nil
	}
	name := c.Path(sf.File)
	f, err := OpenRegular(name)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	other, err := logs.NewReaderFormat(f, name, sf.SpeedFileColumns(), sf.ReaderFormat())
	if err != nil {
		f.Close()
		return nil, err
	}
	return &SpeedJoin{ip: logs.NewInterp(r, timeK, other, 0, 1, sf.OffsetS), file: f, sf: sf}, nil
}

// Kmh returns the speed at the log's current row, in km/h; a time outside
// the speed file's span is an error at the row.
func (j *SpeedJoin) Kmh() (float64, error) {
	x, err := j.ip.Value()
	return air.MsToKmh(j.sf.SpeedToMs(x)), err
}

// Close releases the speed file.
func (j *SpeedJoin) Close() {
	j.ip.Close()
	j.file.Close()
}
