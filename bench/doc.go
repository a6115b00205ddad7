// Package bench is thalweg's benchmark module: see bench_test.go and the
// README's "Performance" section.
package bench
