package main

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"regexp"
	"strings"
	"sync"

	"heliocal/config"
)

// stdinPath is the --config value that reads the configuration from
// standard input.
const stdinPath = "-"

// stdinSource names standard input where a file name would be printed.
const stdinSource = "standard input"

// loadConfig resolves the configuration: --config (a file, or "-" for
// standard input), else ./heliocal.yaml, else the built-in demo, with
// HELIOCAL_ environment overrides. Every failure is bad input (exit code 2).
func loadConfig(g *globals) (*config.Config, config.Source, error) {
	env := config.LookupEnv(g.getenv)
	var (
		cfg *config.Config
		src config.Source
		err error
	)
	if g.configPath == stdinPath {
		src = config.Source{Path: stdinSource}
		cfg, err = parseStdin(g.stdin, env)
	} else {
		cfg, src, err = config.Resolve(g.configPath, env)
	}
	if err != nil {
		var ve *config.ValidationError
		if errors.As(err, &ve) {
			return nil, src, ve // each line already names the file, field and value
		}
		switch {
		case g.configPath == stdinPath:
			err = fmt.Errorf("--config -: %w", err)
		case g.configPath != "":
			err = fmt.Errorf("--config %w", err) // the error begins with the path
		case src.Demo:
			err = fmt.Errorf("%s configuration: %w", src, err)
		} // else the error begins with the default file's path
		return nil, src, inputError{err}
	}
	return cfg, src, nil
}

// parseStdin reads a whole configuration from r and parses it in the format
// its text shows (see sniffFormat).
func parseStdin(r io.Reader, env config.LookupEnv) (*config.Config, error) {
	if r == nil {
		return nil, errors.New("no standard input to read")
	}
	data, err := io.ReadAll(r)
	if err != nil {
		return nil, fmt.Errorf("%w: %w", config.ErrUnreadable, err)
	}
	if len(bytes.TrimSpace(data)) == 0 {
		return nil, errors.New("standard input is empty; pipe a configuration into heliocal, e.g. heliocal check --config - < heliocal.yaml")
	}
	cfg, err := config.ParseEnv(bytes.NewReader(data), sniffFormat(data), env)
	var ve *config.ValidationError
	if errors.As(err, &ve) {
		ve.Source = stdinSource
	}
	return cfg, err
}

// tomlLine is a TOML table header ("[service]", "[[sites]]") or key/value
// line ("listen = ':8080'"); neither is valid at the top of a YAML mapping
// of heliocal's keys. Compiled at first use: most commands never read a
// configuration from standard input.
var tomlLine = sync.OnceValue(func() *regexp.Regexp {
	return regexp.MustCompile(`^(\[\[?[A-Za-z0-9_."-]+\]\]?\s*(#.*)?|[A-Za-z0-9_."-]+\s*=.*)$`)
})

// sniffFormat tells the format of a configuration without a file name from
// its first significant line: "{" starts JSON, a TOML table header or
// key = value line is TOML, anything else is read as YAML.
func sniffFormat(data []byte) string {
	sc := bufio.NewScanner(bytes.NewReader(data))
	sc.Buffer(nil, len(data)+1)
	for sc.Scan() {
		line := strings.TrimSpace(strings.TrimPrefix(sc.Text(), "\ufeff"))
		switch {
		case line == "" || strings.HasPrefix(line, "#"):
			continue
		case strings.HasPrefix(line, "{"):
			return "json"
		case tomlLine().MatchString(line):
			return "toml"
		}
		return "yaml"
	}
	return "yaml"
}
