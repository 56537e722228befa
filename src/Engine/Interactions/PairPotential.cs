using LatticeSweep.Engine.Units;

namespace LatticeSweep.Engine.Interactions;

/// <summary>
/// A pair potential phi(r) between two atoms. Parameters are given in eV and nm (the trade's units);
/// the methods work in SI: r in m, phi in J, phi' in J/m, phi'' in J/m^2. Each form is the textbook
/// one (Kittel, Introduction to Solid State Physics, ch. 3 for Lennard-Jones; Morse, Phys. Rev. 34,
/// 57 (1929); Buckingham, Proc. R. Soc. A 168, 264 (1938)), written here from memory.
/// </summary>
public abstract record PairPotential
{
    /// <summary>phi(r), J.</summary>
    public abstract double EnergyJ(double rM);

    /// <summary>phi'(r), J/m.</summary>
    public abstract double FirstDerivativeJPerM(double rM);

    /// <summary>phi''(r), J/m^2 (= N/m).</summary>
    public abstract double SecondDerivativeNPerM(double rM);

    /// <summary>Name used in messages and the job file ("lennard_jones", "morse", "buckingham").</summary>
    public abstract string FormName { get; }

    protected static double Ev(double ev) => ev * PhysicalConstants.JoulePerEv;

    protected static double M(double nm) => nm * PhysicalConstants.MetresPerNm;
}

/// <summary>Lennard-Jones: phi = 4 epsilon [(sigma/r)^12 - (sigma/r)^6]; minimum -epsilon at r = 2^(1/6) sigma.</summary>
public sealed record LennardJonesPotential(double WellDepthEv, double SigmaNm) : PairPotential
{
    public override string FormName => "lennard_jones";

    public override double EnergyJ(double rM)
    {
        var s6 = Math.Pow(M(SigmaNm) / rM, 6);
        return 4 * Ev(WellDepthEv) * (s6 * s6 - s6);
    }

    public override double FirstDerivativeJPerM(double rM)
    {
        var s6 = Math.Pow(M(SigmaNm) / rM, 6);
        return 4 * Ev(WellDepthEv) * (-12 * s6 * s6 + 6 * s6) / rM;
    }

    public override double SecondDerivativeNPerM(double rM)
    {
        var s6 = Math.Pow(M(SigmaNm) / rM, 6);
        return 4 * Ev(WellDepthEv) * (156 * s6 * s6 - 42 * s6) / (rM * rM);
    }
}

/// <summary>Morse: phi = D [(1 - e^{-a (r - r0)})^2 - 1]; minimum -D at r0, phi''(r0) = 2 D a^2.</summary>
public sealed record MorsePotential(double WellDepthEv, double R0Nm, double WidthPerNm) : PairPotential
{
    public override string FormName => "morse";

    private double A => WidthPerNm / PhysicalConstants.MetresPerNm;

    public override double EnergyJ(double rM)
    {
        var x = Math.Exp(-A * (rM - M(R0Nm)));
        return Ev(WellDepthEv) * (x * x - 2 * x);
    }

    public override double FirstDerivativeJPerM(double rM)
    {
        var x = Math.Exp(-A * (rM - M(R0Nm)));
        return Ev(WellDepthEv) * A * (-2 * x * x + 2 * x);
    }

    public override double SecondDerivativeNPerM(double rM)
    {
        var x = Math.Exp(-A * (rM - M(R0Nm)));
        return Ev(WellDepthEv) * A * A * (4 * x * x - 2 * x);
    }
}

/// <summary>
/// Buckingham (Born-Mayer repulsion with dispersion): phi = A e^{-r/rho} - C / r^6. It turns over and
/// falls to minus infinity at short range; only the well beyond that maximum is physical.
/// </summary>
public sealed record BuckinghamPotential(double RepulsionEv, double RhoNm, double DispersionEvNm6) : PairPotential
{
    public override string FormName => "buckingham";

    private double C => Ev(DispersionEvNm6) * Math.Pow(PhysicalConstants.MetresPerNm, 6);

    public override double EnergyJ(double rM) =>
        Ev(RepulsionEv) * Math.Exp(-rM / M(RhoNm)) - C / Math.Pow(rM, 6);

    public override double FirstDerivativeJPerM(double rM) =>
        -Ev(RepulsionEv) / M(RhoNm) * Math.Exp(-rM / M(RhoNm)) + 6 * C / Math.Pow(rM, 7);

    public override double SecondDerivativeNPerM(double rM) =>
        Ev(RepulsionEv) / (M(RhoNm) * M(RhoNm)) * Math.Exp(-rM / M(RhoNm)) - 42 * C / Math.Pow(rM, 8);
}
