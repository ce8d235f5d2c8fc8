package solve

// chooseSmoother picks the relaxation of a level from its couplings.
func chooseSmoother(l mgLevel) Smoother { return PointGS }

func (f *fineLevel) smoothLines(post bool) { panic("solve: line relaxation not built") }

func (l *coarseLevel) smoothLines(post bool) { panic("solve: line relaxation not built") }
