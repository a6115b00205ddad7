module github.com/nadir-opt/nadir

go 1.26.0

require (
	github.com/dave/jennifer v1.7.1 // indirect
	github.com/pelletier/go-toml/v2 v2.4.3 // indirect
	github.com/spf13/pflag v1.1.0 // indirect
	golang.org/x/tools v0.52.0 // indirect
)
