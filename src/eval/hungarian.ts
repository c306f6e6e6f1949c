// Minimum-cost assignment (the Hungarian method).
//
// Method: Kuhn, "The Hungarian method for the assignment problem", Naval Research Logistics
// Quarterly 2, 1955; Munkres, "Algorithms for the assignment and transportation problems",
// J. SIAM 5, 1957. This is the shortest-augmenting-path form with row and column potentials
// (as in Jonker & Volgenant, "A shortest augmenting path algorithm for dense and sparse linear
// assignment problems", Computing 38, 1987): each row is added in O(n·m) with Dijkstra-like
// relaxation on reduced costs, O(n²·m) in total — O(n³) for square matrices.

export interface Assignment {
  /** Column assigned to each row (every row gets a distinct column). */
  readonly rowToColumn: Int32Array;
  readonly totalCost: number;
}

/**
 * Assign each of `rows` rows to a distinct column of a rows×cols row-major cost matrix,
 * minimizing the total cost. Needs rows ≤ cols (transpose otherwise; see assignRectangular).
 */
export function hungarian(cost: Float64Array, rows: number, cols: number): Assignment {
  if (rows > cols) throw new Error(`hungarian needs rows ≤ cols (got ${rows}×${cols}).`);
  if (cost.length !== rows * cols) throw new Error(`cost has ${cost.length} entries; expected ${rows * cols}.`);
  // 1-based arrays; column 0 is the virtual start of each augmenting path.
  const u = new Float64Array(rows + 1);
  const v = new Float64Array(cols + 1);
  const rowOfCol = new Int32Array(cols + 1); // 0 = free
  const way = new Int32Array(cols + 1);
  const minv = new Float64Array(cols + 1);
  const used = new Uint8Array(cols + 1);
  for (let i = 1; i <= rows; i++) {
    rowOfCol[0] = i;
    let j0 = 0;
    minv.fill(Infinity);
    used.fill(0);
    do {
      used[j0] = 1;
      const i0 = rowOfCol[j0];
      let delta = Infinity;
      let j1 = 0;
      const base = (i0 - 1) * cols;
      for (let j = 1; j <= cols; j++) {
        if (used[j]) continue;
        const reduced = cost[base + j - 1] - u[i0] - v[j];
        if (reduced < minv[j]) {
          minv[j] = reduced;
          way[j] = j0;
        }
        if (minv[j] < delta) {
          delta = minv[j];
          j1 = j;
        }
      }
      for (let j = 0; j <= cols; j++) {
        if (used[j]) {
          u[rowOfCol[j]] += delta;
          v[j] -= delta;
        } else minv[j] -= delta;
      }
      j0 = j1;
    } while (rowOfCol[j0] !== 0);
    do {
      const j1 = way[j0];
      rowOfCol[j0] = rowOfCol[j1];
      j0 = j1;
    } while (j0 !== 0);
  }
  const rowToColumn = new Int32Array(rows).fill(-1);
  let total = 0;
  for (let j = 1; j <= cols; j++) {
    const i = rowOfCol[j];
    if (i > 0) {
      rowToColumn[i - 1] = j - 1;
      total += cost[(i - 1) * cols + j - 1];
    }
  }
  return { rowToColumn, totalCost: total };
}

/**
 * Like hungarian for any shape: when rows > cols, only `cols` rows can be matched and the
 * others get −1.
 */
export function assignRectangular(cost: Float64Array, rows: number, cols: number): Assignment {
  if (rows <= cols) return hungarian(cost, rows, cols);
  const t = new Float64Array(rows * cols);
  for (let i = 0; i < rows; i++) for (let j = 0; j < cols; j++) t[j * rows + i] = cost[i * cols + j];
  const inner = hungarian(t, cols, rows);
  const rowToColumn = new Int32Array(rows).fill(-1);
  for (let j = 0; j < cols; j++) rowToColumn[inner.rowToColumn[j]] = j;
  return { rowToColumn, totalCost: inner.totalCost };
}
