// Command fleet prints the configuration of an invented fleet of sites
// (internal/fleet: the same one the publish benchmark uses), so that
// publishing at scale can be timed as the command ships:
//
//	go run ./tools/fleet -sites 1000 > /tmp/fleet.yaml
//	heliocal --config /tmp/fleet.yaml publish --out /tmp/fleet-out
package main

import (
	"flag"
	"fmt"
	"os"

	"heliocal/internal/fleet"
)

func main() {
	n := flag.Int("sites", 1000, "number of sites, one feed each")
	flag.Parse()
	if *n < 1 || *n > fleet.MaxSites {
		fmt.Fprintf(os.Stderr, "fleet: -sites %d: give a number from 1 to %d\n", *n, fleet.MaxSites)
		os.Exit(2)
	}
	fmt.Print(fleet.YAML(*n))
}
