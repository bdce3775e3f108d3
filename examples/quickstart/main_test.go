package main

import "testing"

// TestQuickstart runs the README's first program so that it cannot rot.
func TestQuickstart(t *testing.T) { main() }
