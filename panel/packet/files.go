package packet

// File names Build writes beside the raters' folders, for the coordinator only.
const (
	KeyFile      = "key.parquet"
	ManifestFile = "manifest.json"
)

// File names Build writes into each rater's folder.
const (
	PageFile  = "review.html"
	SheetFile = "sheet.csv"
)
