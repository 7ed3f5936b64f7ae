package config_test

import (
	"fmt"
	"strings"

	"heliocal/config"
)

func ExampleParseKind() {
	for _, s := range []string{"sunrise", "sun-altitude:-3.5", "photoperiod:870m", "sunrize"} {
		k, err := config.ParseKind(s)
		if err != nil {
			fmt.Println(err)
			continue
		}
		fmt.Println(k, k.IsSpan(), k.IsYearly())
	}
	// Output:
	// sunrise false false
	// sun-altitude:-3.5 false false
	// photoperiod:14h30m false false
	// unknown kind "sunrize" (did you mean "sunrise"?)
}

func ExampleParse() {
	_, err := config.Parse(strings.NewReader(`
sites:
  - id: north-field
    latitude: 95
    longitude: 9.7
    timezone: Europe/Zurik
feeds:
  - id: north-sun
    site: north-feild
    kinds: [sunrize, {kind: sunset, offset: -30m}]
`), "yaml")
	fmt.Println(err)
	// Output:
	// sites[0].latitude: 95: must be within -90..90 (decimal degrees, north positive, south negative, e.g. -42.88 for 42°52′48″S)
	// sites[0].timezone: Europe/Zurik: unknown time zone (did you mean "Europe/Zurich"?)
	// feeds[0].site: north-feild: no site has this id (did you mean "north-field"?)
	// feeds[0].kinds[0]: sunrize: unknown kind (did you mean "sunrise"?)
}

func ExampleDemo() {
	c := config.Demo()
	for _, s := range c.Sites {
		fmt.Printf("%-10s %7.2f %8.2f %s\n", s.ID, s.Latitude, s.Longitude, s.TimeZone.Name())
	}
	// Output:
	// fernhollow   48.26    15.92 Europe/Vienna
	// tallowgum   -41.35   172.98 Pacific/Auckland
	// cairnmoor    39.08  -105.42 America/Denver
	// skarvlia     68.80    15.40 Europe/Oslo
	// brackenfold   47.05    11.20 Europe/Vienna
}
