module github.com/ramify-tax/ramify

go 1.26.8

require (
	github.com/BurntSushi/toml v1.6.0
	github.com/chromedp/chromedp v0.23.1
	github.com/creack/pty v1.1.24
	github.com/google/go-cmp v0.7.0
	github.com/parquet-go/parquet-go v0.32.0
	github.com/piprate/json-gold v0.9.1
	github.com/rogpeppe/go-internal v1.16.0
	github.com/sbinet/npyio v0.6.0
	github.com/sergi/go-diff v1.4.0
	github.com/spf13/pflag v1.1.0
	golang.org/x/term v0.48.0
	golang.org/x/text v0.23.0
	gonum.org/v1/gonum v0.17.0
)

require (
	github.com/andybalholm/brotli v1.1.1 // indirect
	github.com/campoy/embedmd v1.0.0 // indirect
	github.com/cayleygraph/quad v1.3.0 // indirect
	github.com/chromedp/cdproto v0.160.1 // indirect
	github.com/go-json-experiment/json v0.0.0-20260213210345-44df1a37e875 // indirect
	github.com/google/uuid v1.6.0 // indirect
	github.com/klauspost/compress v1.17.9 // indirect
	github.com/parquet-go/bitpack v1.0.0 // indirect
	github.com/parquet-go/jsonlite v1.0.0 // indirect
	github.com/pierrec/lz4/v4 v4.1.21 // indirect
	github.com/pmezard/go-difflib v1.0.0 // indirect
	github.com/pquerna/cachecontrol v0.2.0 // indirect
	github.com/twpayne/go-geom v1.6.1 // indirect
	golang.org/x/sys v0.50.0 // indirect
	golang.org/x/tools v0.30.0 // indirect
	google.golang.org/protobuf v1.34.2 // indirect
)
