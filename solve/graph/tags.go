package graph

// Tags is the package function Tags with b's settings.
func (b Builder) Tags(tags [][]string) (*CSR, error) {
	return b.sparseGraph(tagRows(tags))
}

// tagRows weighs tag sets into normalised sparse rows.
func tagRows(tags [][]string) *sparseRows {
	docs := make([][]string, len(tags))
	for i, ts := range tags {
		for _, t := range ts {
			if t != "" {
				docs[i] = append(docs[i], t)
			}
		}
	}
	_, rows := weighDocs(docs, Weighting{TF: BinaryTF, IDF: TextbookIDF}, commonTermCap(len(tags)))
	return rows
}
