"""Leakage inductance of two concentric windings in one transformer window, by a 2-D finite-element
solution (scikit-fem, https://github.com/kinnala/scikit-fem, from PyPI).

The window is a rectangle bounded by iron of very high permeability: the tangential field at its
walls is zero, so the vector potential A_z has zero normal derivative there (Neumann on every wall).
Two windings carry equal and opposite ampere-turns (N·I = 100 A, the transformer at load with the
magnetising current neglected): -div grad A = mu0 J in the window. The stored energy per metre of
depth W' = 1/2 ∫ A·J dS gives, referred to the 100-turn winding at I = 1 A, L = 2·W'·MLT / I².

Window 20 mm wide, 60 mm high; winding 1 from x = 1 to 7 mm, winding 2 from x = 8 to 14 mm (builds
6 mm, gap 1 mm), both from y = 2 to 58 mm (traverse 56 mm); MLT 200 mm; N = 100.

Run: pip install scikit-fem && python3 tests/fem/leakage_window.py
The values it prints are committed in src/leakage.rs (test lee_against_a_finite_element_window);
the library is not.
"""
import numpy as np
from skfem import MeshTri, Basis, ElementTriP2, BilinearForm, LinearForm, asm, solve, condense
from skfem.helpers import dot, grad

MU0 = 4e-7 * np.pi
N, I, MLT = 100, 1.0, 0.200
W, H = 0.020, 0.060
w1 = (0.001, 0.007)
w2 = (0.008, 0.014)
y0, y1 = 0.002, 0.058


def grid(points, step):
    out = [points[0]]
    for a, b in zip(points[:-1], points[1:]):
        n = max(1, int(np.ceil((b - a) / step)))
        out.extend(np.linspace(a, b, n + 1)[1:])
    return np.array(out)


def solve_for(step, y0=y0, y1=y1):
    xs = grid([0.0, w1[0], w1[1], w2[0], w2[1], W], step)
    ys = grid(sorted({0.0, y0, y1, H}), step)
    mesh = MeshTri.init_tensor(xs, ys)
    basis = Basis(mesh, ElementTriP2())
    area = (w1[1] - w1[0]) * (y1 - y0)
    j0 = N * I / area

    def current(x, y):
        inside_y = (y > y0) & (y < y1)
        return np.where((x > w1[0]) & (x < w1[1]) & inside_y, j0,
                        np.where((x > w2[0]) & (x < w2[1]) & inside_y, -j0, 0.0))

    @BilinearForm
    def laplace(u, v, w):
        return dot(grad(u), grad(v)) / MU0

    @LinearForm
    def load(v, w):
        return current(w.x[0], w.x[1]) * v

    K = asm(laplace, basis)
    f = asm(load, basis)
    # The potential is defined up to a constant: fix it at one node (the loads sum to zero).
    fixed = np.array([0])
    A = solve(*condense(K, f, D=fixed))
    energy = 0.5 * A @ f
    return 2.0 * energy * MLT / I ** 2


if __name__ == "__main__":
    for step in (0.0010, 0.0005, 0.00025):
        print(f"mesh {step*1e3:.2f} mm: L = {solve_for(step)*1e6:.3f} uH")
    lee = MU0 * N ** 2 * MLT * (0.001 + (0.006 + 0.006) / 3.0) / (y1 - y0)
    print(f"Lee's formula with h = traverse: {lee*1e6:.3f} uH")
    # The same windings over the whole height (no margins): the field is the 1-D one Lee's formula
    # assumes, so the two must agree.
    full = solve_for(0.0005, 0.0, H)
    lee_full = MU0 * N ** 2 * MLT * (0.001 + (0.006 + 0.006) / 3.0) / H
    print(f"full height: FEM {full*1e6:.3f} uH, Lee {lee_full*1e6:.3f} uH")
