package store

import (
	"fmt"
	"strings"
)

// kindSpec describes one input kind: its exact header and its loader.
type kindSpec struct {
	kind   Kind
	cols   []string
	loader func() loader
}

// kinds lists the input kinds in load order (see Kind).
var kinds = []kindSpec{
	{KindPortfolios, []string{"portfolio_id", "portfolio_name", "strategy", "inception_date", "benchmark_method"}, newPortfolioLoader},
	{KindSecurities, []string{"security_id", "security_name", "sector", "currency", "shares_outstanding"}, newSecurityLoader},
	{KindAssumptions, []string{"security_id", "effective_date", "annual_dividend", "frequency", "growth", "beta", "discount_rate", "stages"}, newAssumptionLoader},
	{KindPrices, []string{"date", "security_id", "close", "dividend", "split_ratio"}, newPriceLoader},
	{KindYields, []string{"date", "tenor_months", "yield"}, newYieldLoader},
	{KindPremiums, []string{"date", "equity_risk_premium"}, newPremiumLoader},
	{KindHoldings, []string{"as_of", "portfolio_id", "security_id", "quantity", "price"}, newHoldingLoader},
	{KindFlows, []string{"date", "portfolio_id", "amount"}, newFlowLoader},
}

// Header returns the exact header row of an input kind's CSV file, or
// nil for an unknown kind. Writers of ingestible files (export) use it so
// the two can never disagree.
func Header(k Kind) []string {
	for i := range kinds {
		if kinds[i].kind == k {
			return append([]string(nil), kinds[i].cols...)
		}
	}
	return nil
}

// kindOrder is the load rank of k; unknown kinds come last.
func kindOrder(k Kind) int {
	for i := range kinds {
		if kinds[i].kind == k {
			return i
		}
	}
	return len(kinds)
}

// matchHeader returns the kind whose header is exactly fields.
func matchHeader(fields [][]byte) *kindSpec {
	for i := range kinds {
		k := &kinds[i]
		if len(k.cols) != len(fields) {
			continue
		}
		same := true
		for j, c := range k.cols {
			if string(fields[j]) != c {
				same = false
				break
			}
		}
		if same {
			return k
		}
	}
	return nil
}

// headerHint explains an unknown header, naming the closest kind (most
// column names in common, ignoring case).
func headerHint(fields [][]byte) string {
	best, bestN := -1, 0
	for i := range kinds {
		n := 0
		for _, c := range kinds[i].cols {
			for _, f := range fields {
				if strings.EqualFold(strings.TrimSpace(string(f)), c) {
					n++
					break
				}
			}
		}
		if n > bestN {
			best, bestN = i, n
		}
	}
	if best < 0 {
		names := make([]string, len(kinds))
		for i := range kinds {
			names[i] = string(kinds[i].kind)
		}
		return "is not the header of any input kind (" + strings.Join(names, ", ") + ")"
	}
	k := kinds[best]
	return fmt.Sprintf("is not a known header; the closest is %s, whose header is exactly %s",
		k.kind, strings.Join(k.cols, ","))
}
