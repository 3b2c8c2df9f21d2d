package circuits

import "sort"

// pattern is the structure of an MNA matrix: the (row, column) positions a
// stamp touches, whatever their values at one frequency.
type pattern struct {
	n     int
	pairs [][2]int32
}

func (p *pattern) add(r, c int) { p.pairs = append(p.pairs, [2]int32{int32(r), int32(c)}) }

// adjacency returns the symmetric graph of the pattern: for each unknown
// its neighbours (self excluded), sorted and without repeats.
func (p *pattern) adjacency() [][]int {
	adj := make([][]int, p.n)
	for _, e := range p.pairs {
		r, c := int(e[0]), int(e[1])
		if r == c {
			continue
		}
		adj[r] = append(adj[r], c)
		adj[c] = append(adj[c], r)
	}
	for i, a := range adj {
		sort.Ints(a)
		k := 0
		for j, v := range a {
			if j == 0 || v != a[k-1] {
				a[k] = v
				k++
			}
		}
		adj[i] = a[:k]
	}
	return adj
}

// bands returns the lower and upper bandwidth of the pattern under perm
// (perm[old] = new).
func (p *pattern) bands(perm []int) (kl, ku int) {
	for _, e := range p.pairs {
		d := perm[e[1]] - perm[e[0]]
		if d > ku {
			ku = d
		}
		if -d > kl {
			kl = -d
		}
	}
	return kl, ku
}

// rcmOrder is the reverse Cuthill–McKee ordering of a graph (Cuthill &
// McKee 1969; reversed as George 1971 showed to reduce fill): breadth
// first from a pseudo-peripheral vertex of each connected component
// (George & Liu 1979), neighbours taken in rising degree, the whole order
// then reversed. On a ladder it walks along the network, so each coil's
// branch unknown lands between the two nodes it joins and the bandwidth
// stays a small constant however many sections there are. Ties break by
// index, so the ordering is deterministic. It returns perm[old] = new.
func rcmOrder(adj [][]int) []int {
	n := len(adj)
	order := make([]int, 0, n)
	placed := make([]bool, n)
	level := make([]int, n)
	byDegree := func(a []int) {
		sort.Slice(a, func(i, j int) bool {
			di, dj := len(adj[a[i]]), len(adj[a[j]])
			if di != dj {
				return di < dj
			}
			return a[i] < a[j]
		})
	}
	// bfs returns the vertices of start's component in breadth-first
	// order and the index in it where the last level begins.
	seen := make([]int, n) // generation stamp per vertex
	gen := 0
	bfs := func(start int) ([]int, int) {
		gen++
		q := []int{start}
		seen[start] = gen
		level[start] = 0
		lastStart := 0
		for h := 0; h < len(q); h++ {
			v := q[h]
			if level[v] != level[q[lastStart]] {
				lastStart = h
			}
			for _, u := range adj[v] {
				if seen[u] != gen && !placed[u] {
					seen[u] = gen
					level[u] = level[v] + 1
					q = append(q, u)
				}
			}
		}
		return q, lastStart
	}
	for s := 0; s < n; s++ {
		if placed[s] {
			continue
		}
		// pseudo-peripheral start: from the component's lowest-degree
		// vertex, jump to the lowest-degree vertex of the last level while
		// that lengthens the level structure
		comp, _ := bfs(s)
		start := comp[0]
		for _, v := range comp {
			if len(adj[v]) < len(adj[start]) {
				start = v
			}
		}
		q, last := bfs(start)
		depth := level[q[len(q)-1]]
		for iter := 0; iter < 8; iter++ {
			cand := q[last]
			for _, v := range q[last:] {
				if len(adj[v]) < len(adj[cand]) {
					cand = v
				}
			}
			q2, last2 := bfs(cand)
			if d := level[q2[len(q2)-1]]; d > depth {
				start, q, last, depth = cand, q2, last2, d
				continue
			}
			break
		}
		// Cuthill–McKee from start
		first := len(order)
		order = append(order, start)
		placed[start] = true
		var nb []int
		for h := first; h < len(order); h++ {
			nb = nb[:0]
			for _, u := range adj[order[h]] {
				if !placed[u] {
					nb = append(nb, u)
				}
			}
			byDegree(nb)
			for _, u := range nb {
				placed[u] = true
				order = append(order, u)
			}
		}
	}
	perm := make([]int, n)
	for k, v := range order {
		perm[v] = n - 1 - k
	}
	return perm
}
