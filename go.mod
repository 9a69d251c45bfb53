module github.com/gnomon-forensics/gnomon

go 1.26.0

require (
	github.com/disintegration/imaging v1.6.2
	github.com/ringsaturn/tzf v1.0.2
	github.com/ringsaturn/tzf-rel-lite v0.0.2025-b2
	github.com/rwcarlsen/goexif v0.0.0-20190401172101-9e8deecbddbd
	github.com/schollz/progressbar/v3 v3.19.1
	github.com/tidwall/geojson v1.4.5
	github.com/twpayne/go-polyline v1.1.1
	golang.org/x/image v0.48.0
	golang.org/x/term v0.44.0
	google.golang.org/protobuf v1.36.9
)

require (
	github.com/mitchellh/colorstring v0.0.0-20190213212951-d06e56a500db // indirect
	github.com/mitchellh/mapstructure v1.5.0 // indirect
	github.com/paulmach/orb v0.12.0 // indirect
	github.com/rivo/uniseg v0.4.7 // indirect
	github.com/tidwall/geoindex v1.7.0 // indirect
	github.com/tidwall/rtree v1.10.0 // indirect
	go.mongodb.org/mongo-driver v1.11.4 // indirect
	golang.org/x/sys v0.50.0 // indirect
)
