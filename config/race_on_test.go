//go:build race

package config

// raceEnabled: the race detector slows loading the zone polygons about
// fiftyfold; the plain test run covers them.
const raceEnabled = true
