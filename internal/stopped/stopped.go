// Package stopped tells work that stopped because its context was cancelled
// (a signal, a server shutting down) from work that failed: the first is
// logged and reported as stopped, never counted as a failure.
package stopped

import (
	"context"
	"errors"
)

// By reports whether err is ctx's own ending: ctx is done and err wraps
// ctx.Err() (context.Canceled, or context.DeadlineExceeded for a deadline).
// An error that wraps another context's cancellation while ctx is live,
// another way of ending (a deadline's error when ctx was cancelled), or a
// failure that only happened while ctx was done, is not. The errors are
// shared values: another context's cancellation, ctx cancelled too, counts
// as ctx's.
func By(ctx context.Context, err error) bool {
	return err != nil && ctx.Err() != nil && errors.Is(err, ctx.Err())
}
