namespace LatticeSweep.Engine.Dos;

/// <summary>
/// Fraction of a simplex (interval, triangle, tetrahedron) whose linearly interpolated value lies
/// below e, for sorted corner values. Differences of this function give bin-integrated densities
/// of states that stay exact at van Hove singularities. The tetrahedron form is the integrated
/// number of states of the linear tetrahedron method (Bloechl, Jepsen and Andersen,
/// Phys. Rev. B 49, 16223 (1994), eq. A2-A4 without the curvature correction); the triangle and
/// interval forms are its 2D and 1D analogues (common practice, no source).
/// </summary>
internal static class SimplexCumulative
{
    public static double Interval(double e, double e1, double e2)
    {
        if (e <= e1)
        {
            return 0;
        }

        return e >= e2 ? 1 : (e - e1) / (e2 - e1);
    }

    public static double Triangle(double e, double e1, double e2, double e3)
    {
        if (e <= e1)
        {
            return 0;
        }

        if (e >= e3)
        {
            return 1;
        }

        if (e < e2)
        {
            return (e - e1) * (e - e1) / ((e2 - e1) * (e3 - e1));
        }

        return 1 - (e3 - e) * (e3 - e) / ((e3 - e1) * (e3 - e2));
    }

    public static double Tetrahedron(double e, double e1, double e2, double e3, double e4)
    {
        if (e <= e1)
        {
            return 0;
        }

        if (e >= e4)
        {
            return 1;
        }

        if (e < e2)
        {
            var x = e - e1;
            return x * x * x / ((e2 - e1) * (e3 - e1) * (e4 - e1));
        }

        if (e < e3)
        {
            var e21 = e2 - e1;
            var x = e - e2;
            return (e21 * e21 + 3 * e21 * x + 3 * x * x - (e3 - e1 + e4 - e2) / ((e3 - e2) * (e4 - e2)) * x * x * x)
                / ((e3 - e1) * (e4 - e1));
        }

        var y = e4 - e;
        return 1 - y * y * y / ((e4 - e1) * (e4 - e2) * (e4 - e3));
    }
}
