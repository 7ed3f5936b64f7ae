// Command heliocal computes the Sun's and Moon's events for configured sites
// and publishes them as iCalendar feeds. Run "heliocal --help".
package main

import (
	"context"
	"os"
	"os/signal"
	"syscall"

	_ "time/tzdata" // feeds must not depend on the host's zone files
)

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	code := run(ctx, os.Args[1:], os.Stdout, os.Stderr, os.LookupEnv)
	stop()
	os.Exit(code)
}
