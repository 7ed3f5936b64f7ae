package main

import (
	"bytes"
	"errors"
	"fmt"
	"io"

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
		var se *config.SyntaxError
		if errors.As(err, &se) && se.Source != "" {
			return nil, src, inputError{se} // "farm.yaml:5: cannot read the file as yaml: …"
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
// its text shows (see config.SniffFormat).
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
	cfg, err := config.ParseEnv(bytes.NewReader(data), config.SniffFormat(data), env)
	var ve *config.ValidationError
	if errors.As(err, &ve) {
		ve.Source = stdinSource
	}
	var se *config.SyntaxError
	if errors.As(err, &se) {
		se.Source = stdinSource
	}
	return cfg, err
}
