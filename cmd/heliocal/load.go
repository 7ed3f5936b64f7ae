package main

import (
	"errors"
	"fmt"

	"heliocal/config"
)

// loadConfig resolves the configuration: --config, else ./heliocal.yaml,
// else the built-in demo, with HELIOCAL_ environment overrides. Every
// failure is bad input (exit code 2).
func loadConfig(g *globals) (*config.Config, config.Source, error) {
	cfg, src, err := config.Resolve(g.configPath, config.LookupEnv(g.getenv))
	if err != nil {
		var ve *config.ValidationError
		if errors.As(err, &ve) {
			return nil, src, ve // each line already names the file, field and value
		}
		return nil, src, inputError{fmt.Errorf("configuration (%s): %w", src, err)}
	}
	return cfg, src, nil
}
