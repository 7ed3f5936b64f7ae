//go:build amd64 && !amd64.v3

package astro

// sunTableExact: the compiler does not fuse a multiplication and an
// addition into one instruction here (amd64 below GOAMD64=v3), as on the
// machine that writes suntable.bin, so the computation gives the stored
// bits again (TestSunTable).
const sunTableExact = true
