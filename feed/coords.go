package feed

import (
	"math"
	"strconv"
)

// Coords writes a latitude and longitude in degrees with their hemisphere
// letters and the given number of decimals: Coords(-33.45, -70.6667, 3) is
// "33.450° S, 70.667° W". Every place the tool names a site's coordinates
// writes them so.
func Coords(lat, lon float64, decimals int) string {
	ns, ew := " N", " E"
	if lat < 0 {
		ns = " S"
	}
	if lon < 0 {
		ew = " W"
	}
	b := strconv.AppendFloat(nil, math.Abs(lat), 'f', decimals, 64)
	b = append(append(b, "°"...), ns...)
	b = strconv.AppendFloat(append(b, ", "...), math.Abs(lon), 'f', decimals, 64)
	return string(append(append(b, "°"...), ew...))
}

// CoordsName is the name of a place given by its coordinates alone (`events
// --lat --lon`, ad-hoc feeds without a name): "45.0000° S, 72.0000° W", as
// Coords writes them to four decimals. Texts that name a site recognise it
// and write the coordinates only once.
func CoordsName(lat, lon float64) string {
	return Coords(lat, lon, 4)
}
