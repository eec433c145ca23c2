// Package demo writes a deterministic, entirely fictional scenario as input
// CSV files in the formats of the shared contract, so the demonstration pack
// is built by the same ingestion code path as a user's own files.
//
// Everything in the scenario is invented: the firm (Quillmere Asset
// Partners), its three portfolios, the fifty companies with their names and
// tickers, the prices, dividends, splits, yield curve, equity risk premium,
// external flows and valuation assumptions. Any resemblance to a real
// company, ticker, index or person is accidental. No market data is used.
//
// The model behind the numbers, in short:
//
//   - Daily log total return of stock i on weekday t:
//     r = a_i + beta_i*m_t + f_sector,t + e_i,t, where the market factor m_t
//     switches between a calm and a stressed volatility regime (a two-state
//     Markov chain) and carries a crash of about -34% over five weeks a third
//     of the way into the history (two years of six), followed by a partial
//     recovery. The noise is pinned to sum to zero over fixed segments so
//     the designed shape survives any seed. Closes are unadjusted: on a
//     split day the close falls by the split ratio, on an ex-date by the
//     dividend (contract: r_t = s_t*(P_t+D_t)/P_{t-1} - 1).
//   - Cash dividends are paid 1, 2, 4 or 12 times a year on fixed ex-dates,
//     raised once a year; one energy name halves its dividend after the crash.
//   - Zero-coupon yields follow a Nelson-Siegel curve whose level, slope and
//     curvature revert to targets that include a period of rising rates; the
//     equity risk premium reverts to about 4.8% and widens in the crash.
//   - Each portfolio holds whole lots, credits dividends to cash on ex-dates,
//     books external flows into cash on their date and rebalances quarterly
//     (or when cash drifts out of its band) at the snapshot close.
//
// Two data problems are planted on purpose so the pack has something to
// report; Summary.Findings names them:
//
//   - VRDT (Veridane Therapeutics, growth portfolio): from about nine weeks
//     before the end the assumptions set discount_rate 0.068 below growth
//     0.07, so k <= g and the constant-growth value is undefined.
//   - KMSP (Kingsmere Storage Properties, income portfolio): prices.csv has
//     no close on the last snapshot date; the holdings file carries the
//     previous day's close (a stale price). KMSP never goes ex on that day,
//     so the cash in the snapshots still reconciles.
//
// Same Options, same bytes: randomness comes from math/rand/v2 PCG sources
// seeded from Options.Seed, output is written in sorted order and nothing
// reads the clock.
package demo
