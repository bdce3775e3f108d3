// Package parallel holds the worker loop shared by the example programs.
package parallel

import (
	"context"
	"runtime"
	"sync"
)

// Each runs do(w, i) for i in 0..n-1 on GOMAXPROCS goroutines, each with
// its own worker state w from newWorker; it stops handing out work when
// ctx is cancelled and returns ctx's error then.
func Each[W any](ctx context.Context, n int, newWorker func() W, do func(w W, i int)) error {
	var wg sync.WaitGroup
	next := make(chan int)
	for range runtime.GOMAXPROCS(0) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			w := newWorker()
			for i := range next {
				do(w, i)
			}
		}()
	}
	var err error
	for i := 0; i < n; i++ {
		if err = ctx.Err(); err != nil {
			break
		}
		next <- i
	}
	close(next)
	wg.Wait()
	return err
}
