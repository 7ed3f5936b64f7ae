package main

import (
	"context"
	"errors"
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"heliocal/astro"
	"heliocal/config"
)

// Exit codes.
const (
	exitOK      = 0
	exitFailure = 1 // the command failed at run time
	exitInput   = 2 // bad flags, bad configuration or out-of-range input
)

// inputError marks an error caused by what the user gave: exit code 2.
type inputError struct{ err error }

func (e inputError) Error() string { return e.err.Error() }
func (e inputError) Unwrap() error { return e.err }

func badInput(format string, args ...any) error {
	return inputError{fmt.Errorf(format, args...)}
}

// globals are the settings every command shares.
type globals struct {
	configPath string
	stdout     io.Writer
	stderr     io.Writer
	getenv     func(string) (string, bool)
}

const exitStatusHelp = `

EXIT STATUS
  0  success
  1  the command failed while running (e.g. a file could not be written)
  2  bad input: unknown flag, invalid configuration, date out of range`

// run executes the command line and returns the process exit code.
func run(ctx context.Context, args []string, stdout, stderr io.Writer, getenv func(string) (string, bool)) int {
	g := &globals{stdout: stdout, stderr: stderr, getenv: getenv}
	root := newRootCommand(g)
	root.SetArgs(args)
	root.SetOut(stdout)
	root.SetErr(stderr)
	err := root.ExecuteContext(ctx)
	if err == nil {
		return exitOK
	}
	fmt.Fprintln(stderr, "heliocal:", err)
	return exitCode(err)
}

func exitCode(err error) int {
	var ie inputError
	var ve *config.ValidationError
	switch {
	case err == nil:
		return exitOK
	case errors.As(err, &ie), errors.As(err, &ve), errors.Is(err, astro.ErrOutOfRange):
		return exitInput
	}
	return exitFailure
}

func newRootCommand(g *globals) *cobra.Command {
	root := &cobra.Command{
		Use:   "heliocal",
		Short: "Sun and Moon events as calendar feeds",
		Long: `heliocal computes sunrise, sunset, twilight, golden hour, day-length thresholds, equinoxes,
solstices, Moon phases, moonrise and dark-sky windows for the sites you configure, and
publishes them as iCalendar feeds that calendar apps subscribe to.

Configuration: --config FILE, else ./heliocal.yaml, else the built-in demo.` + exitStatusHelp,
		SilenceUsage:  true,
		SilenceErrors: true,
	}
	root.PersistentFlags().StringVarP(&g.configPath, "config", "c", "", "configuration file (YAML, TOML or JSON)")
	root.SetFlagErrorFunc(func(_ *cobra.Command, err error) error { return inputError{err} })
	root.AddCommand(
		newEventsCommand(g),
		newCheckCommand(g),
		newPublishCommand(g),
		newServeCommand(g),
		newVersionCommand(g),
	)
	return root
}
