namespace LatticeSweep.Engine.Numerics.Simd;

/// <summary>
/// A SIMD vector of doubles seen as independent lanes, one small matrix per lane, so each batched
/// kernel is written once and compiled for every width (<see cref="Lanes4"/>, <see cref="Lanes8"/>).
/// The JIT specialises a generic method per struct type, so these calls cost nothing. Comparisons
/// return masks (all bits set where true) for <see cref="Select"/>.
/// </summary>
internal interface ILanes<TSelf>
    where TSelf : unmanaged, ILanes<TSelf>
{
    /// <summary>Lanes (matrices solved together).</summary>
    static abstract int Count { get; }

    static abstract TSelf Zero { get; }

    static abstract TSelf One { get; }

    static abstract TSelf Create(double value);

    /// <summary>Lane k from values[k]; values has at least <see cref="Count"/> elements.</summary>
    static abstract TSelf Create(ReadOnlySpan<double> values);

    static abstract TSelf operator +(TSelf a, TSelf b);

    static abstract TSelf operator -(TSelf a, TSelf b);

    static abstract TSelf operator -(TSelf a);

    static abstract TSelf operator *(TSelf a, TSelf b);

    static abstract TSelf operator *(double a, TSelf b);

    /// <summary>a b + c with one rounding.</summary>
    static abstract TSelf MultiplyAdd(TSelf a, TSelf b, TSelf c);

    static abstract TSelf Abs(TSelf a);

    static abstract TSelf Max(TSelf a, TSelf b);

    /// <summary>The smaller of each lane, by the same rules as <see cref="Max"/> (-0 below +0).</summary>
    static abstract TSelf Min(TSelf a, TSelf b);

    static abstract TSelf Sqrt(TSelf a);

    /// <summary>1 / a to about one ulp.</summary>
    static abstract TSelf Reciprocal(TSelf a);

    /// <summary>1 / sqrt(a) to about one ulp.</summary>
    static abstract TSelf ReciprocalSqrt(TSelf a);

    static abstract TSelf LessThan(TSelf a, TSelf b);

    static abstract TSelf LessThanOrEqual(TSelf a, TSelf b);

    static abstract TSelf Equal(TSelf a, TSelf b);

    static abstract TSelf Or(TSelf a, TSelf b);

    /// <summary>ifTrue where the mask is set, else ifFalse.</summary>
    static abstract TSelf Select(TSelf mask, TSelf ifTrue, TSelf ifFalse);

    static abstract bool AllLessThan(TSelf a, TSelf b);

    static abstract bool AllLessThanOrEqual(TSelf a, TSelf b);

    static abstract bool AllEqual(TSelf a, TSelf b);

    /// <summary>True when any lane of the mask is set.</summary>
    static abstract bool Any(TSelf mask);

    /// <summary>The largest lane.</summary>
    static abstract double MaxAcross(TSelf a);

    double this[int lane] { get; }
}
