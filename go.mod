module github.com/chanlint/chanlint

go 1.26.8

require (
	github.com/agext/levenshtein v1.2.1
	github.com/fatih/color v1.19.0
	github.com/hashicorp/hcl/v2 v2.25.0
	github.com/mattn/go-isatty v0.0.20
	github.com/owenrumney/go-sarif/v3 v3.3.1
	github.com/stretchr/testify v1.12.1
	github.com/zclconf/go-cty v1.20.0
	golang.org/x/sync v0.18.0
	golang.org/x/tools v0.38.0
	gonum.org/v1/gonum v0.17.0
	pgregory.net/rapid v1.3.0
)

require (
	github.com/apparentlymart/go-textseg/v15 v15.0.0 // indirect
	github.com/apparentlymart/go-textseg/v17 v17.0.1 // indirect
	github.com/google/go-cmp v0.6.0 // indirect
	github.com/mattn/go-colorable v0.1.14 // indirect
	github.com/mitchellh/go-wordwrap v1.0.1 // indirect
	github.com/xeipuuv/gojsonpointer v0.0.0-20180127040702-4e3ac2762d5f // indirect
	github.com/xeipuuv/gojsonreference v0.0.0-20180127040603-bd5ef7bd5415 // indirect
	github.com/xeipuuv/gojsonschema v1.2.0 // indirect
	go.yaml.in/yaml/v3 v3.0.5 // indirect
	golang.org/x/mod v0.29.0 // indirect
	golang.org/x/sys v0.50.0 // indirect
	golang.org/x/text v0.31.0 // indirect
)
