package fuse

import "sync"

// workers is how many goroutines share independent jobs: the machines
// this runs on have two cores.
const workers = 2

// parallel calls fn(0) … fn(n−1) on workers goroutines, each job once, and
// returns when all are done. Jobs must not write what other jobs read.
func parallel(n int, fn func(i int)) {
	jobs := make(chan int)
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range jobs {
				fn(i)
			}
		}()
	}
	for i := range n {
		jobs <- i
	}
	close(jobs)
	wg.Wait()
}
