package networks

// unionFind groups the integers 0..n−1 into disjoint sets (with path
// halving): which nodes a path of elements joins.
type unionFind []int

func newUnionFind(n int) unionFind {
	u := make(unionFind, n)
	for i := range u {
		u[i] = i
	}
	return u
}

// find returns the representative of i's set.
func (u unionFind) find(i int) int {
	for u[i] != i {
		u[i] = u[u[i]]
		i = u[i]
	}
	return i
}

// union joins the sets of a and b.
func (u unionFind) union(a, b int) { u[u.find(a)] = u.find(b) }
