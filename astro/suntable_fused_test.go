//go:build !amd64 || amd64.v3

package astro

// sunTableExact: the compiler may fuse a multiplication and an addition
// into one instruction, with one rounding instead of two (arm64, ppc64,
// s390x, riscv64, amd64 with GOAMD64=v3 and above), so the computation
// differs from the stored table in its last bits (TestSunTable).
const sunTableExact = false
