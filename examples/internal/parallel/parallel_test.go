package parallel

import (
	"context"
	"sync/atomic"
	"testing"
)

func TestEach(t *testing.T) {
	var sum atomic.Int64
	seen := make([]atomic.Int32, 100)
	err := Each(context.Background(), 100, func() int { return 1 }, func(w, i int) {
		sum.Add(int64(w * i))
		seen[i].Add(1)
	})
	if err != nil || sum.Load() != 4950 {
		t.Fatalf("sum %d, err %v", sum.Load(), err)
	}
	for i := range seen {
		if seen[i].Load() != 1 {
			t.Fatalf("item %d done %d times", i, seen[i].Load())
		}
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if err := Each(ctx, 10, func() int { return 0 }, func(int, int) {}); err == nil {
		t.Error("cancelled context: no error")
	}
}
