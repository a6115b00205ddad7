module github.com/thalweg-go/thalweg/bench

go 1.26.0

require (
	github.com/thalweg-go/thalweg v0.0.0
	gonum.org/v1/gonum v0.17.0
)

require (
	github.com/dave/jennifer v1.7.1 // indirect
	github.com/pelletier/go-toml/v2 v2.4.3 // indirect
	golang.org/x/mod v0.42.0 // indirect
	golang.org/x/sync v0.24.0 // indirect
	golang.org/x/tools v0.52.0 // indirect
)

replace github.com/thalweg-go/thalweg => ../
