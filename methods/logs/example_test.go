package logs_test

import (
	"fmt"
	"strings"

	"liftfuse/methods/logs"
)

// A European logger's export read with every format key detected, and
// speed from a GPS file whose clock runs 2 s ahead.
func ExampleInterp() {
	day := "\xEF\xBB\xBFlogger 7\nt;h_mm\ns;mm\n12:00:00,00;118,5\n12:00:00,05;118,7\n12:00:00,10;118,6\n"
	// GPS 12:00:02.0 is the logger's 12:00:00.0: 101 km/h there, 103 at 0.1 s.
	gps := "time,kmh\n12:00:01.9,100\n12:00:02.0,101\n12:00:02.1,103\n"
	r, err := logs.NewReaderFormat(strings.NewReader(day), "day.csv", []logs.Column{{Name: "t", Time: true}, {Name: "h_mm"}}, logs.Format{})
	if err != nil {
		fmt.Println(err)
		return
	}
	defer r.Close()
	fmt.Println(r.Detected())
	g, err := logs.NewReader(strings.NewReader(gps), "gps.csv", []logs.Column{{Name: "time", Time: true}, {Name: "kmh"}})
	if err != nil {
		fmt.Println(err)
		return
	}
	speed := logs.NewInterp(r, 0, g, 0, 1, -2)
	defer speed.Close()
	for r.Next() {
		v, err := speed.Value()
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("%.2f s  %.1f mm  %.1f km/h\n", r.Float(0), r.Float(1), v)
	}
	// Output:
	// delimiter ";", decimal ",", header on line 2, 1 units row skipped, clock time
	// 0.00 s  118.5 mm  101.0 km/h
	// 0.05 s  118.7 mm  102.0 km/h
	// 0.10 s  118.6 mm  103.0 km/h
}

// Every missing column is reported at once, with the closest name.
func ExampleNewReaderFormat_missingColumns() {
	_, err := logs.NewReaderFormat(strings.NewReader("Time,Pot_FL,gps\n0,1,2\n"), "day.csv",
		[]logs.Column{{Name: "Time"}, {Name: "pot_fl"}, {Name: "speed"}}, logs.Format{})
	for _, pe := range logs.ParseErrors(err) {
		fmt.Println(pe)
	}
	// Output:
	// day.csv:1:6: column "pot_fl": not in the header (columns: Time, Pot_FL, gps); did you mean "Pot_FL"?
	// day.csv:1:1: column "speed": not in the header (columns: Time, Pot_FL, gps)
}
