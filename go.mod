module github.com/thalweg-go/thalweg

go 1.26.0

require (
	github.com/dave/jennifer v1.7.1
	github.com/pelletier/go-toml/v2 v2.4.3
	github.com/spf13/pflag v1.1.0
	golang.org/x/tools v0.52.0
)

require (
	golang.org/x/mod v0.42.0 // indirect
	golang.org/x/sync v0.24.0 // indirect
)

tool github.com/thalweg-go/thalweg/cmd/thalweg
