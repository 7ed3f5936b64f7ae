package stopped

import (
	"context"
	"errors"
	"fmt"
	"testing"
	"time"
)

func TestBy(t *testing.T) {
	live := context.Background()
	cancelled, cancel := context.WithCancel(context.Background())
	cancel()
	expired, cancelExpired := context.WithDeadline(context.Background(), time.Unix(0, 0))
	defer cancelExpired()
	for _, tc := range []struct {
		name string
		ctx  context.Context
		err  error
		want bool
	}{
		{"no error", cancelled, nil, false},
		{"cancelled, its cancellation wrapped", cancelled, fmt.Errorf("publish: %w", context.Canceled), true},
		{"cancelled, its cancellation itself", cancelled, context.Canceled, true},
		{"cancelled, a failure of its own", cancelled, errors.New("publish: disk full"), false},
		{"cancelled, a deadline's error", cancelled, fmt.Errorf("fetch: %w", context.DeadlineExceeded), false},
		{"deadline passed, its error wrapped", expired, fmt.Errorf("publish: %w", context.DeadlineExceeded), true},
		{"live, another context's cancellation", live, fmt.Errorf("publish: %w", context.Canceled), false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if got := By(tc.ctx, tc.err); got != tc.want {
				t.Errorf("By(ctx, %v) = %v, want %v", tc.err, got, tc.want)
			}
		})
	}
}
