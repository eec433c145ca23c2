package store

// Portfolios: portfolio_id,portfolio_name,strategy,inception_date,benchmark_method.

const insertPortfolio = `INSERT INTO portfolios (portfolio_id, name, strategy, inception_date, benchmark_method, source_file_id, source_line)
VALUES (?, ?, ?, ?, ?, ?, ?)`

var portfolioTable = keyedTable{
	lookup: `SELECT p.name, p.strategy, p.inception_date, p.benchmark_method, p.source_file_id, p.source_line, f.name
FROM portfolios p JOIN ingest_files f ON f.id = p.source_file_id
WHERE p.portfolio_id = ?`,
	key:  []int{0},
	cols: []int{1, 2, 3, 4},
}

// benchmarkMethods are the ways the benchmark index of all securities can
// be built.
var benchmarkMethods = []string{"value", "price", "equal", "equal_geometric"}

type portfolioLoader struct{}

func newPortfolioLoader() loader { return portfolioLoader{} }

func (portfolioLoader) row(lc *loadCtx, r *row) error {
	r.match(0, portfolioIDRe, portfolioIDRule)
	name := r.text(1)
	strategy := r.text(2)
	r.date(3)
	if r.required(4) && !oneOf(string(r.f[4]), benchmarkMethods) {
		r.fail(4, "is not one of value, price, equal, equal_geometric")
	}
	if !r.ok {
		return nil
	}
	s, err := lc.c.prepare(insertPortfolio)
	if err != nil {
		return err
	}
	s.set(string(r.f[0]), name, strategy, string(r.f[3]), string(r.f[4]), lc.fileID, r.line)
	return lc.put(s, &portfolioTable, r)
}

func (portfolioLoader) finish(*loadCtx) error { return nil }

func oneOf(s string, set []string) bool {
	for _, x := range set {
		if s == x {
			return true
		}
	}
	return false
}
