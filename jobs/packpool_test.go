package jobs

import (
	"context"
	"errors"
	"sync/atomic"
	"testing"
)

// TestInOrder: results reach use in index order on the calling goroutine
// whatever order the workers finish in, and no more than 2·workers are
// ever started ahead of use (the bound on memory held by waiting results).
func TestInOrder(t *testing.T) {
	for _, tc := range []struct{ n, workers int }{{0, 2}, {1, 2}, {7, 1}, {50, 2}, {50, 8}, {3, 16}} {
		var used, started atomic.Int64
		var order []int
		first := make(chan struct{})
		var maxAhead atomic.Int64
		err := inOrder(context.Background(), tc.n, tc.workers, func(_ context.Context, i int) int {
			ahead := started.Add(1) - used.Load()
			for m := maxAhead.Load(); ahead > m && !maxAhead.CompareAndSwap(m, ahead); m = maxAhead.Load() {
			}
			// The first item finishes only after another one has, when
			// there is another worker, so results arrive out of order.
			if i == 0 && tc.workers > 1 && tc.n > 1 {
				<-first
			}
			if i == 1 {
				close(first)
			}
			return i * i
		}, func(i, v int) {
			if v != i*i {
				t.Errorf("n=%d workers=%d: use(%d, %d), want %d", tc.n, tc.workers, i, v, i*i)
			}
			order = append(order, i)
			used.Add(1)
		})
		if err != nil {
			t.Fatalf("n=%d workers=%d: %v", tc.n, tc.workers, err)
		}
		if len(order) != tc.n {
			t.Fatalf("n=%d workers=%d: use called %d times", tc.n, tc.workers, len(order))
		}
		for i, v := range order {
			if v != i {
				t.Fatalf("n=%d workers=%d: use order %v", tc.n, tc.workers, order)
			}
		}
		if limit := int64(2 * max(1, min(tc.workers, tc.n))); maxAhead.Load() > limit {
			t.Errorf("n=%d workers=%d: %d results started ahead of use, limit %d", tc.n, tc.workers, maxAhead.Load(), limit)
		}
	}
}

// TestInOrderCancel: a context cancelled during use stops the loop with
// its error before the next result is used; work given a context that is
// done returns, so inOrder does too.
func TestInOrderCancel(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	var used []int
	err := inOrder(ctx, 100, 2, func(wctx context.Context, i int) int {
		if i > 4 {
			<-wctx.Done() // only a cancelled context lets these finish
		}
		return i
	}, func(i, _ int) {
		used = append(used, i)
		if i == 3 {
			cancel()
		}
	})
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("err = %v, want context.Canceled", err)
	}
	if len(used) != 4 || used[3] != 3 {
		t.Errorf("used %v, want 0..3", used)
	}
}
