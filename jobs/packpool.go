package jobs

import (
	"context"
	"sync"
)

// inOrder calls work(ctx, i) for every i in [0, n) on up to workers
// goroutines and use(i, result) on the calling goroutine, in order of i,
// as each result is ready. So work may run concurrently (it must only
// read shared data) while use sees the results one at a time and in
// order, as a plain loop would: pack runs compute in parallel and are
// stored one transaction at a time (SQLite serialises writers anyway) in
// portfolio order, so run ids and results are the same as sequentially.
//
// At most 2·workers results are computed ahead of use, which bounds the
// memory held by finished results waiting for an earlier slow one.
//
// inOrder stops early, returning ctx.Err(), when ctx is done before a
// result is used; it returns only when every goroutine it started has
// finished.
func inOrder[T any](ctx context.Context, n, workers int, work func(context.Context, int) T, use func(int, T)) error {
	if n == 0 {
		return ctx.Err()
	}
	workers = max(1, min(workers, n))
	wctx, cancel := context.WithCancel(ctx)
	slots := make(chan struct{}, 2*workers) // one per result started and not yet used
	next := make(chan int)
	results := make([]chan T, n)
	for i := range results {
		results[i] = make(chan T, 1) // a worker never waits for use
	}
	var wg sync.WaitGroup
	defer func() {
		cancel()
		wg.Wait()
	}()
	wg.Add(1 + workers)
	go func() {
		defer wg.Done()
		defer close(next)
		for i := range n {
			select {
			case slots <- struct{}{}:
			case <-wctx.Done():
				return
			}
			select {
			case next <- i:
			case <-wctx.Done():
				return
			}
		}
	}()
	for range workers {
		go func() {
			defer wg.Done()
			for i := range next {
				results[i] <- work(wctx, i)
			}
		}()
	}
	for i := range n {
		if err := ctx.Err(); err != nil {
			return err
		}
		var v T
		select {
		case v = <-results[i]:
		case <-ctx.Done():
			return ctx.Err()
		}
		<-slots
		use(i, v)
	}
	return nil
}
