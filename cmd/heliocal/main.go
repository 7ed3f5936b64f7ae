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
	// SIGINT and SIGTERM cancel the command's context until the process
	// exits. They are not handed back to their default action first: each
	// would wait on the runtime's signal thread to change a signal mask
	// the exit discards anyway (≈ 0.1 ms between the last write and the
	// exit, at every run). They are caught by a goroutine of their own,
	// while the command starts: the first signal.Notify starts that
	// signal thread and waits for it, 0.1–0.2 ms that every run waited
	// for before its command began. A signal that comes before the
	// goroutine has asked for it ends the process, as one before main does.
	ctx, cancel := context.WithCancel(context.Background())
	go func() {
		sig := make(chan os.Signal, 1)
		signal.Notify(sig, os.Interrupt, syscall.SIGTERM)
		<-sig
		cancel()
	}()
	os.Exit(run(ctx, os.Args[1:], os.Stdout, os.Stderr, os.LookupEnv))
}
