package uncertain

// firstDraws are N(10, 1) draws 1–3 from rand.NewPCG(1, 1), recorded with Go 1.26.
var firstDraws = []float64{10.906357766968014, 10.443963647658734, 9.216761228383927}
