package store

import (
	"errors"
	"io"
	"sync"
)

// recordReader yields CSV records: fields, the line the record starts on,
// and io.EOF, a *csvError (call again to go on) or a read error.
type recordReader interface {
	next() ([][]byte, int, error)
}

// pipedReader runs a csvReader in its own goroutine, so that reading,
// hashing and splitting a large file overlap with validating and storing
// it on the caller's goroutine. Records travel in batches whose buffers
// are recycled, so memory stays bounded: pipeDepth batches of at most
// pipeBatch records (or about pipeBytes bytes).
type pipedReader struct {
	full chan *recBatch
	free chan *recBatch
	done chan struct{}
	wg   sync.WaitGroup

	cur    *recBatch
	i, f   int // next item and next field end in cur
	fields [][]byte
	end    error // terminal error, once seen
}

const (
	pipeBatch = 1024
	pipeBytes = 256 << 10
	pipeDepth = 4
)

type recItem struct {
	line int
	nf   int       // number of fields; 0 with err set
	err  *csvError // a malformed record
}

type recBatch struct {
	items []recItem
	buf   []byte
	ends  []int
	err   error // after the items: io.EOF or a read error
}

func newPipedReader(r io.Reader) *pipedReader {
	p := &pipedReader{
		full: make(chan *recBatch, pipeDepth),
		free: make(chan *recBatch, pipeDepth+1),
		done: make(chan struct{}),
	}
	for i := 0; i < pipeDepth+1; i++ {
		p.free <- &recBatch{}
	}
	p.wg.Add(1)
	go p.produce(newCSVReader(r))
	return p
}

func (p *pipedReader) produce(cr *csvReader) {
	defer p.wg.Done()
	var ce *csvError // outside the loop: errors.As(err, &ce) would allocate it per row
	for {
		var b *recBatch
		select {
		case b = <-p.free:
		case <-p.done:
			return
		}
		b.items, b.buf, b.ends, b.err = b.items[:0], b.buf[:0], b.ends[:0], nil
		for len(b.items) < pipeBatch && len(b.buf) < pipeBytes {
			fields, line, err := cr.next()
			if err != nil && errors.As(err, &ce) {
				b.items = append(b.items, recItem{line: line, err: ce})
				continue
			}
			if err != nil {
				b.err = err
				break
			}
			for _, f := range fields {
				b.buf = append(b.buf, f...)
				b.ends = append(b.ends, len(b.buf))
			}
			b.items = append(b.items, recItem{line: line, nf: len(fields)})
		}
		select {
		case p.full <- b:
		case <-p.done:
			return
		}
		if b.err != nil {
			return
		}
	}
}

func (p *pipedReader) next() ([][]byte, int, error) {
	for {
		if p.end != nil {
			return nil, 0, p.end
		}
		if p.cur != nil && p.i < len(p.cur.items) {
			it := p.cur.items[p.i]
			p.i++
			if it.err != nil {
				return nil, it.line, it.err
			}
			p.fields = p.fields[:0]
			from := 0
			if p.f > 0 {
				from = p.cur.ends[p.f-1]
			}
			for k := 0; k < it.nf; k++ {
				end := p.cur.ends[p.f]
				p.fields = append(p.fields, p.cur.buf[from:end:end])
				from = end
				p.f++
			}
			return p.fields, it.line, nil
		}
		if p.cur != nil {
			if p.cur.err != nil {
				p.end = p.cur.err
				continue
			}
			p.free <- p.cur
		}
		p.cur, p.i, p.f = <-p.full, 0, 0
	}
}

// close stops the reading goroutine and waits for it, after which the
// underlying reader is no longer used.
func (p *pipedReader) close() {
	close(p.done)
	p.wg.Wait()
}
