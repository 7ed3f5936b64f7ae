package serve_test

import (
	"context"
	"log/slog"
	"os"
	"os/signal"
	"syscall"

	"heliocal/feed/publish"
	"heliocal/feed/serve"
)

// The command line wires a Server like this (compiled, not run: it serves
// until a signal): Build renders every feed of the
// loaded configuration; SIGTERM or SIGINT cancel the context and shut down
// gracefully; SIGHUP loads the configuration again and calls Reload, which
// keeps the old feeds if the new build fails.
func Example() {
	render := func(ctx context.Context, gzip serve.GzipFunc) (*publish.Bundle, error) {
		// the real one renders the configuration's feeds with publish.Render,
		// its RenderOptions.Gzip set to gzip
		return &publish.Bundle{}, nil
	}
	srv, err := serve.New(serve.Options{
		Logger:   slog.New(slog.NewJSONHandler(os.Stderr, nil)),
		Build:    render,
		Schedule: "15 3 * * *",
	})
	if err != nil {
		slog.Error("serve", "err", err)
		return
	}
	ctx, stop := signal.NotifyContext(context.Background(), syscall.SIGINT, syscall.SIGTERM)
	defer stop()
	hup := make(chan os.Signal, 1)
	signal.Notify(hup, syscall.SIGHUP)
	go func() {
		for range hup {
			srv.Reload(ctx, render) // parse and validate the new file first; on error keep serving
		}
	}()
	if err := srv.ListenAndRun(ctx, "127.0.0.1:8080"); err != nil {
		slog.Error("serve", "err", err)
	}
}
