package interval

import "github.com/kofnlab/kofn/internal/argerr"

// cornfield fills in the exact conditional limits; it needs Fisher's
// noncentral hypergeometric distribution.
func cornfield(iv *Interval, k1, n1, k2, n2 int64, lv level, midp bool) error {
	return argerr.NoSolution("interval.OddsRatio", "the exact conditional interval is not available yet")
}
