module clatter

go 1.26.8

require (
	github.com/BurntSushi/toml v1.6.0 // indirect
	github.com/go-gl/mathgl v1.2.0 // indirect
	github.com/hschendel/stl v1.0.4 // indirect
	gonum.org/v1/gonum v0.17.0 // indirect
)
