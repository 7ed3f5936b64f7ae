package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"slices"
	"strconv"
	"strings"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

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

// silentError carries an error whose report has already been written (as
// JSON on standard output): run sets the exit code from it without
// printing it again.
type silentError struct{ err error }

func (e silentError) Error() string { return e.err.Error() }
func (e silentError) Unwrap() error { return e.err }

func badInput(format string, args ...any) error {
	return inputError{fmt.Errorf(format, args...)}
}

// noSuchID refuses the id v of flag (--site, --feed) that no configured
// what has: it names the one whose name (a site's name, a feed's title,
// names[i] for ids[i], called nameWord) v is, else the one v likely means,
// as the configuration's own suggestions do, and lists the configured ids.
func noSuchID(flag, what, v string, ids, names []string, nameWord string) error {
	named := ""
	for i, n := range names {
		if n != "" && strings.EqualFold(strings.TrimSpace(n), strings.TrimSpace(v)) {
			if named != "" {
				named = ""
				break
			}
			named = ids[i]
		}
	}
	if named != "" {
		return badInput("%s: %q: no such %s: that is the %s of the %s %q: give its id (configured: %s)", flag, v, what, nameWord, what, named, strings.Join(ids, ", "))
	}
	if near := config.Suggest(v, ids); near != "" {
		return badInput("%s: %q: no such %s: did you mean %q? (configured: %s)", flag, v, what, near, strings.Join(ids, ", "))
	}
	return badInput("%s: %q: no such %s (configured: %s)", flag, v, what, strings.Join(ids, ", "))
}

// checkBaseURLFlag refuses a --base-url the configuration would refuse as
// service.base_url (not http(s), a query, credentials); "" is no flag.
func checkBaseURLFlag(v string) error {
	if v == "" {
		return nil
	}
	if err := config.CheckBaseURL(v); err != nil {
		return badInput("--base-url: %w", err)
	}
	return nil
}

// globals are the settings every command shares.
type globals struct {
	configPath string
	stdin      io.Reader // read by --config -
	stdout     io.Writer
	stderr     io.Writer
	getenv     func(string) (string, bool)
}

const exitStatusHelp = `

EXIT STATUS
  0  success
  1  the command failed while running (e.g. a file could not be written)
  2  bad input: unknown flag, invalid configuration, date out of range`

// run executes the command line and returns the process exit code; the
// configuration may come from standard input (--config -).
func run(ctx context.Context, args []string, stdout, stderr io.Writer, getenv func(string) (string, bool)) int {
	return runWithInput(ctx, args, os.Stdin, stdout, stderr, getenv)
}

// runWithInput is run with the standard input given.
func runWithInput(ctx context.Context, args []string, stdin io.Reader, stdout, stderr io.Writer, getenv func(string) (string, bool)) int {
	g := &globals{stdin: stdin, stdout: stdout, stderr: stderr, getenv: getenv}
	root := newRootCommand(g)
	root.SetArgs(args)
	root.SetOut(stdout)
	root.SetErr(stderr)
	err := root.ExecuteContext(ctx)
	if err == nil {
		return exitOK
	}
	if strings.HasPrefix(err.Error(), "unknown command ") {
		err = inputError{unknownCommand(err)} // cobra's own error for an unknown command or a stray argument
	}
	if !errors.As(err, new(silentError)) {
		// every line, as every other line heliocal writes to stderr:
		// each problem of a configuration is a line of its own
		fmt.Fprint(stderr, prefixLines(err.Error()))
	}
	return exitCode(err)
}

// unknownCommand is cobra's error for an unknown command on one line, its
// suggestions in brackets: `unknown command "publsh" for "heliocal" (did
// you mean "publish"?)` rather than a block of four lines.
func unknownCommand(err error) error {
	first, rest, _ := strings.Cut(err.Error(), "\n")
	_, suggested, ok := strings.Cut(rest, "Did you mean this?")
	if !ok {
		return err
	}
	var names []string
	for _, name := range strings.Fields(suggested) {
		names = append(names, strconv.Quote(name))
	}
	if len(names) == 0 {
		return errors.New(first)
	}
	return errors.New(first + " (did you mean " + strings.Join(names, " or ") + "?)")
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

// versionTemplateFunc names the template function that gives --version its
// text. The build information is read only when the flag is given (≈ 50,000
// instructions, at every start when the text was the root's Version).
const versionTemplateFunc = "heliocalVersion"

func init() {
	// registered before any goroutine runs: cobra's template functions are
	// one map for the whole program
	cobra.AddTemplateFunc(versionTemplateFunc, func() string { return currentVersion().String() })
}

func newRootCommand(g *globals) *cobra.Command {
	root := &cobra.Command{
		Use:   "heliocal",
		Short: "Sun and Moon events as calendar feeds",
		Long: `heliocal computes sunrise, sunset, twilight, golden hour, day-length thresholds, lamp
periods, equinoxes, solstices, Moon phases, moonrise, dark-sky windows and solar and lunar
eclipses for the sites you configure, and publishes them as iCalendar feeds that calendar
apps subscribe to.

Configuration: --config FILE, else ./heliocal.yaml, else the built-in demo.` + exitStatusHelp,
		SilenceUsage:  true,
		SilenceErrors: true,
		Version:       "set", // non-empty for --version; the text is versionTemplateFunc's
	}
	root.SetVersionTemplate("{{" + versionTemplateFunc + "}}\n")
	// cobra would add it as "version for heliocal"
	root.Flags().BoolP("version", "v", false, "print the version (also: heliocal version)")
	installHelp(root, g)
	root.PersistentFlags().StringVarP(&g.configPath, "config", "c", "", "configuration file (YAML, TOML or JSON); - reads it from standard input")
	root.SetFlagErrorFunc(func(_ *cobra.Command, err error) error { return inputError{flagValueError(err)} })
	root.PersistentPreRunE = func(cmd *cobra.Command, _ []string) error { return emptyFlags(cmd) }
	root.CompletionOptions.DisableDefaultCmd = true
	root.AddCommand(
		newCompletionCommand(g),
		newEventsCommand(g),
		newCheckCommand(g),
		newPublishCommand(g),
		newServeCommand(g),
		newVersionCommand(g),
	)
	// Wrong positional arguments are bad input (exit 2), whatever the command.
	var wrap func(*cobra.Command)
	wrap = func(c *cobra.Command) {
		if args := c.Args; args != nil {
			c.Args = func(cmd *cobra.Command, a []string) error {
				if err := args(cmd, a); err != nil {
					return inputError{err}
				}
				return nil
			}
		}
		for _, sub := range c.Commands() {
			wrap(sub)
		}
	}
	wrap(root)
	return root
}

var completionShells = []string{"bash", "zsh", "fish", "powershell"}

// newCompletionCommand prints a shell completion script; an unknown or
// missing shell is bad input (exit 2).
func newCompletionCommand(g *globals) *cobra.Command {
	return &cobra.Command{
		Use:   "completion bash|zsh|fish|powershell",
		Short: "Print a shell completion script",
		Long: `Print the completion script for a shell, e.g.
  heliocal completion bash > /etc/bash_completion.d/heliocal
  heliocal completion zsh > "${fpath[1]}/_heliocal"
  heliocal completion fish > ~/.config/fish/completions/heliocal.fish
  heliocal completion powershell | Out-String | Invoke-Expression` + exitStatusHelp,
		ValidArgs: completionShells,
		Args: func(_ *cobra.Command, args []string) error {
			switch {
			case len(args) != 1:
				return fmt.Errorf("completion: name one shell: %s", strings.Join(completionShells, ", "))
			case !slices.Contains(completionShells, args[0]):
				return fmt.Errorf("completion: %q: unknown shell (use %s)", args[0], strings.Join(completionShells, ", "))
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			root := cmd.Root()
			switch args[0] {
			case "bash":
				return root.GenBashCompletionV2(g.stdout, true)
			case "zsh":
				return root.GenZshCompletion(g.stdout)
			case "fish":
				return root.GenFishCompletion(g.stdout, true)
			}
			return root.GenPowerShellCompletionWithDesc(g.stdout)
		},
	}
}

// emptyHints say what an empty value would have quietly stood for, where
// that is far from what the user meant: a script's --config "$CONF" with
// $CONF unset would read ./heliocal.yaml or the built-in demo, and its
// --out "$DIR" would publish into the default directory.
var emptyHints = map[string]string{
	"config": "give a file, or drop the flag to read ./heliocal.yaml or the built-in demo",
	"out":    "give a directory, or drop the flag to use service.out_dir, public by default",
}

// emptyFlags refuses a text flag given an empty value (--config "", --out=):
// an empty value would stand for the flag left out, silently. The flags
// that refuse it with their own words (--kinds, --format) do so later.
func emptyFlags(cmd *cobra.Command) error {
	var err error
	cmd.Flags().Visit(func(f *pflag.Flag) {
		if err != nil || f.Value.Type() != "string" || f.Value.String() != "" {
			return
		}
		switch f.Name {
		case "kinds", "format", "log-format":
			return
		}
		hint := emptyHints[f.Name]
		if hint == "" {
			hint = "give a value, or drop the flag for its default"
		}
		err = badInput("--%s: \"\": empty (%s)", f.Name, hint)
	})
	return err
}

// flagValueError words a flag's value that does not parse as the flag and
// the value with what is wrong ("--lat: \"abc\": not a number"), not as the
// parser's own message; other flag errors are kept.
func flagValueError(err error) error {
	var iv *pflag.InvalidValueError
	if !errors.As(err, &iv) {
		return err
	}
	what := "not a valid value"
	switch iv.GetFlag().Value.Type() {
	case "float64", "float32":
		what = "not a number"
	case "int", "int64", "int32", "uint", "uint64":
		what = "not a whole number"
	case "bool":
		what = "not true or false"
	case "duration":
		what = `not a duration (a number with a unit, e.g. "30s", "2m")`
	}
	if key, ok := config.ShortKey(iv.GetFlag().Name); ok { // --lat: latitude
		if hint := config.NumberTextHint(key, iv.GetValue()); hint != "" {
			what += " (" + hint + ")"
		}
	}
	return fmt.Errorf("--%s: %q: %s", iv.GetFlag().Name, iv.GetValue(), what)
}

// prefixLines is text with "heliocal: " before each of its lines, and a
// newline after the last: the form of every line heliocal writes to
// stderr.
func prefixLines(text string) string {
	return "heliocal: " + strings.ReplaceAll(text, "\n", "\nheliocal: ") + "\n"
}
