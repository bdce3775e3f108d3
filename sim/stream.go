package sim

import "math/rand/v2"

// EventStream returns the random stream of event number in a run with
// the given seed. Every random draw of an event (its primaries, transport,
// light, sensors and dark noise) comes from this stream alone, so an event
// is the same whichever worker, shard or run position simulates it.
//
// The two 64-bit words of the PCG state are SplitMix64 hashes of the seed
// and of the event number mixed with the hashed seed, so neighbouring
// seeds and event numbers give unrelated streams.
func EventStream(seed, number uint64) *rand.Rand {
	s := splitMix64(seed)
	return rand.New(rand.NewPCG(s, splitMix64(number^splitMix64(s+0x9e3779b97f4a7c15))))
}

// splitMix64 is the finalizer of the SplitMix64 generator (Steele, Lea and
// Flood, "Fast splittable pseudorandom number generators", OOPSLA 2014).
func splitMix64(x uint64) uint64 {
	x += 0x9e3779b97f4a7c15
	x = (x ^ (x >> 30)) * 0xbf58476d1ce4e5b9
	x = (x ^ (x >> 27)) * 0x94d049bb133111eb
	return x ^ (x >> 31)
}
