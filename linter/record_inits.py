"""Record ``__init__`` templates, one per shape (number of fields, frozen, ``__post_init__``).

Written by ``records.kept_templates_source()``: compiling them when a command starts was
about 3 ms of a cold check; kept as a module, their bytecode is cached. Do not edit.
"""


def init_0(self):
    pass


def init_0_post(self):
    self.__post_init__()


def init_0_frozen(self):
    pass


def init_0_frozen_post(self):
    self.__post_init__()


def init_1(self, _rec_a0):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0


def init_1_post(self, _rec_a0):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self.__post_init__()


def init_1_frozen(self, _rec_a0):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)


def init_1_frozen_post(self, _rec_a0):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    self.__post_init__()


def init_2(self, _rec_a0, _rec_a1):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1


def init_2_post(self, _rec_a0, _rec_a1):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self.__post_init__()


def init_2_frozen(self, _rec_a0, _rec_a1):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)


def init_2_frozen_post(self, _rec_a0, _rec_a1):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    self.__post_init__()


def init_3(self, _rec_a0, _rec_a1, _rec_a2):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2


def init_3_post(self, _rec_a0, _rec_a1, _rec_a2):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self.__post_init__()


def init_3_frozen(self, _rec_a0, _rec_a1, _rec_a2):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)


def init_3_frozen_post(self, _rec_a0, _rec_a1, _rec_a2):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    self.__post_init__()


def init_4(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3


def init_4_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self.__post_init__()


def init_4_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)


def init_4_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    self.__post_init__()


def init_5(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4


def init_5_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self.__post_init__()


def init_5_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)


def init_5_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    self.__post_init__()


def init_6(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5


def init_6_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self.__post_init__()


def init_6_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)


def init_6_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    self.__post_init__()


def init_7(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6


def init_7_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self.__post_init__()


def init_7_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)


def init_7_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    self.__post_init__()


def init_8(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7


def init_8_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self.__post_init__()


def init_8_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)


def init_8_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    self.__post_init__()


def init_9(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8


def init_9_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self.__post_init__()


def init_9_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)


def init_9_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    self.__post_init__()


def init_10(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9


def init_10_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self.__post_init__()


def init_10_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)


def init_10_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    self.__post_init__()


def init_11(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10


def init_11_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self.__post_init__()


def init_11_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)


def init_11_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    self.__post_init__()


def init_12(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11


def init_12_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self.__post_init__()


def init_12_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)


def init_12_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    self.__post_init__()


def init_13(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12


def init_13_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self.__post_init__()


def init_13_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)


def init_13_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    self.__post_init__()


def init_14(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13


def init_14_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self.__post_init__()


def init_14_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)


def init_14_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    self.__post_init__()


def init_15(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14


def init_15_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14
    self.__post_init__()


def init_15_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)


def init_15_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)
    self.__post_init__()


def init_16(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14
    self._rec_n15 = _rec_f15() if _rec_a15 is _rec_factory else _rec_a15


def init_16_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14
    self._rec_n15 = _rec_f15() if _rec_a15 is _rec_factory else _rec_a15
    self.__post_init__()


def init_16_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)
    _rec_set(self, '_rec_n15', _rec_f15() if _rec_a15 is _rec_factory else _rec_a15)


def init_16_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)
    _rec_set(self, '_rec_n15', _rec_f15() if _rec_a15 is _rec_factory else _rec_a15)
    self.__post_init__()


def init_17(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14
    self._rec_n15 = _rec_f15() if _rec_a15 is _rec_factory else _rec_a15
    self._rec_n16 = _rec_f16() if _rec_a16 is _rec_factory else _rec_a16


def init_17_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14
    self._rec_n15 = _rec_f15() if _rec_a15 is _rec_factory else _rec_a15
    self._rec_n16 = _rec_f16() if _rec_a16 is _rec_factory else _rec_a16
    self.__post_init__()


def init_17_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)
    _rec_set(self, '_rec_n15', _rec_f15() if _rec_a15 is _rec_factory else _rec_a15)
    _rec_set(self, '_rec_n16', _rec_f16() if _rec_a16 is _rec_factory else _rec_a16)


def init_17_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)
    _rec_set(self, '_rec_n15', _rec_f15() if _rec_a15 is _rec_factory else _rec_a15)
    _rec_set(self, '_rec_n16', _rec_f16() if _rec_a16 is _rec_factory else _rec_a16)
    self.__post_init__()


def init_18(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14
    self._rec_n15 = _rec_f15() if _rec_a15 is _rec_factory else _rec_a15
    self._rec_n16 = _rec_f16() if _rec_a16 is _rec_factory else _rec_a16
    self._rec_n17 = _rec_f17() if _rec_a17 is _rec_factory else _rec_a17


def init_18_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14
    self._rec_n15 = _rec_f15() if _rec_a15 is _rec_factory else _rec_a15
    self._rec_n16 = _rec_f16() if _rec_a16 is _rec_factory else _rec_a16
    self._rec_n17 = _rec_f17() if _rec_a17 is _rec_factory else _rec_a17
    self.__post_init__()


def init_18_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)
    _rec_set(self, '_rec_n15', _rec_f15() if _rec_a15 is _rec_factory else _rec_a15)
    _rec_set(self, '_rec_n16', _rec_f16() if _rec_a16 is _rec_factory else _rec_a16)
    _rec_set(self, '_rec_n17', _rec_f17() if _rec_a17 is _rec_factory else _rec_a17)


def init_18_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)
    _rec_set(self, '_rec_n15', _rec_f15() if _rec_a15 is _rec_factory else _rec_a15)
    _rec_set(self, '_rec_n16', _rec_f16() if _rec_a16 is _rec_factory else _rec_a16)
    _rec_set(self, '_rec_n17', _rec_f17() if _rec_a17 is _rec_factory else _rec_a17)
    self.__post_init__()


def init_19(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14
    self._rec_n15 = _rec_f15() if _rec_a15 is _rec_factory else _rec_a15
    self._rec_n16 = _rec_f16() if _rec_a16 is _rec_factory else _rec_a16
    self._rec_n17 = _rec_f17() if _rec_a17 is _rec_factory else _rec_a17
    self._rec_n18 = _rec_f18() if _rec_a18 is _rec_factory else _rec_a18


def init_19_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14
    self._rec_n15 = _rec_f15() if _rec_a15 is _rec_factory else _rec_a15
    self._rec_n16 = _rec_f16() if _rec_a16 is _rec_factory else _rec_a16
    self._rec_n17 = _rec_f17() if _rec_a17 is _rec_factory else _rec_a17
    self._rec_n18 = _rec_f18() if _rec_a18 is _rec_factory else _rec_a18
    self.__post_init__()


def init_19_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)
    _rec_set(self, '_rec_n15', _rec_f15() if _rec_a15 is _rec_factory else _rec_a15)
    _rec_set(self, '_rec_n16', _rec_f16() if _rec_a16 is _rec_factory else _rec_a16)
    _rec_set(self, '_rec_n17', _rec_f17() if _rec_a17 is _rec_factory else _rec_a17)
    _rec_set(self, '_rec_n18', _rec_f18() if _rec_a18 is _rec_factory else _rec_a18)


def init_19_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)
    _rec_set(self, '_rec_n15', _rec_f15() if _rec_a15 is _rec_factory else _rec_a15)
    _rec_set(self, '_rec_n16', _rec_f16() if _rec_a16 is _rec_factory else _rec_a16)
    _rec_set(self, '_rec_n17', _rec_f17() if _rec_a17 is _rec_factory else _rec_a17)
    _rec_set(self, '_rec_n18', _rec_f18() if _rec_a18 is _rec_factory else _rec_a18)
    self.__post_init__()


def init_20(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14
    self._rec_n15 = _rec_f15() if _rec_a15 is _rec_factory else _rec_a15
    self._rec_n16 = _rec_f16() if _rec_a16 is _rec_factory else _rec_a16
    self._rec_n17 = _rec_f17() if _rec_a17 is _rec_factory else _rec_a17
    self._rec_n18 = _rec_f18() if _rec_a18 is _rec_factory else _rec_a18
    self._rec_n19 = _rec_f19() if _rec_a19 is _rec_factory else _rec_a19


def init_20_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14
    self._rec_n15 = _rec_f15() if _rec_a15 is _rec_factory else _rec_a15
    self._rec_n16 = _rec_f16() if _rec_a16 is _rec_factory else _rec_a16
    self._rec_n17 = _rec_f17() if _rec_a17 is _rec_factory else _rec_a17
    self._rec_n18 = _rec_f18() if _rec_a18 is _rec_factory else _rec_a18
    self._rec_n19 = _rec_f19() if _rec_a19 is _rec_factory else _rec_a19
    self.__post_init__()


def init_20_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)
    _rec_set(self, '_rec_n15', _rec_f15() if _rec_a15 is _rec_factory else _rec_a15)
    _rec_set(self, '_rec_n16', _rec_f16() if _rec_a16 is _rec_factory else _rec_a16)
    _rec_set(self, '_rec_n17', _rec_f17() if _rec_a17 is _rec_factory else _rec_a17)
    _rec_set(self, '_rec_n18', _rec_f18() if _rec_a18 is _rec_factory else _rec_a18)
    _rec_set(self, '_rec_n19', _rec_f19() if _rec_a19 is _rec_factory else _rec_a19)


def init_20_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)
    _rec_set(self, '_rec_n15', _rec_f15() if _rec_a15 is _rec_factory else _rec_a15)
    _rec_set(self, '_rec_n16', _rec_f16() if _rec_a16 is _rec_factory else _rec_a16)
    _rec_set(self, '_rec_n17', _rec_f17() if _rec_a17 is _rec_factory else _rec_a17)
    _rec_set(self, '_rec_n18', _rec_f18() if _rec_a18 is _rec_factory else _rec_a18)
    _rec_set(self, '_rec_n19', _rec_f19() if _rec_a19 is _rec_factory else _rec_a19)
    self.__post_init__()


def init_21(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19, _rec_a20):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14
    self._rec_n15 = _rec_f15() if _rec_a15 is _rec_factory else _rec_a15
    self._rec_n16 = _rec_f16() if _rec_a16 is _rec_factory else _rec_a16
    self._rec_n17 = _rec_f17() if _rec_a17 is _rec_factory else _rec_a17
    self._rec_n18 = _rec_f18() if _rec_a18 is _rec_factory else _rec_a18
    self._rec_n19 = _rec_f19() if _rec_a19 is _rec_factory else _rec_a19
    self._rec_n20 = _rec_f20() if _rec_a20 is _rec_factory else _rec_a20


def init_21_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19, _rec_a20):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14
    self._rec_n15 = _rec_f15() if _rec_a15 is _rec_factory else _rec_a15
    self._rec_n16 = _rec_f16() if _rec_a16 is _rec_factory else _rec_a16
    self._rec_n17 = _rec_f17() if _rec_a17 is _rec_factory else _rec_a17
    self._rec_n18 = _rec_f18() if _rec_a18 is _rec_factory else _rec_a18
    self._rec_n19 = _rec_f19() if _rec_a19 is _rec_factory else _rec_a19
    self._rec_n20 = _rec_f20() if _rec_a20 is _rec_factory else _rec_a20
    self.__post_init__()


def init_21_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19, _rec_a20):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)
    _rec_set(self, '_rec_n15', _rec_f15() if _rec_a15 is _rec_factory else _rec_a15)
    _rec_set(self, '_rec_n16', _rec_f16() if _rec_a16 is _rec_factory else _rec_a16)
    _rec_set(self, '_rec_n17', _rec_f17() if _rec_a17 is _rec_factory else _rec_a17)
    _rec_set(self, '_rec_n18', _rec_f18() if _rec_a18 is _rec_factory else _rec_a18)
    _rec_set(self, '_rec_n19', _rec_f19() if _rec_a19 is _rec_factory else _rec_a19)
    _rec_set(self, '_rec_n20', _rec_f20() if _rec_a20 is _rec_factory else _rec_a20)


def init_21_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19, _rec_a20):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)
    _rec_set(self, '_rec_n15', _rec_f15() if _rec_a15 is _rec_factory else _rec_a15)
    _rec_set(self, '_rec_n16', _rec_f16() if _rec_a16 is _rec_factory else _rec_a16)
    _rec_set(self, '_rec_n17', _rec_f17() if _rec_a17 is _rec_factory else _rec_a17)
    _rec_set(self, '_rec_n18', _rec_f18() if _rec_a18 is _rec_factory else _rec_a18)
    _rec_set(self, '_rec_n19', _rec_f19() if _rec_a19 is _rec_factory else _rec_a19)
    _rec_set(self, '_rec_n20', _rec_f20() if _rec_a20 is _rec_factory else _rec_a20)
    self.__post_init__()


def init_22(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19, _rec_a20, _rec_a21):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14
    self._rec_n15 = _rec_f15() if _rec_a15 is _rec_factory else _rec_a15
    self._rec_n16 = _rec_f16() if _rec_a16 is _rec_factory else _rec_a16
    self._rec_n17 = _rec_f17() if _rec_a17 is _rec_factory else _rec_a17
    self._rec_n18 = _rec_f18() if _rec_a18 is _rec_factory else _rec_a18
    self._rec_n19 = _rec_f19() if _rec_a19 is _rec_factory else _rec_a19
    self._rec_n20 = _rec_f20() if _rec_a20 is _rec_factory else _rec_a20
    self._rec_n21 = _rec_f21() if _rec_a21 is _rec_factory else _rec_a21


def init_22_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19, _rec_a20, _rec_a21):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14
    self._rec_n15 = _rec_f15() if _rec_a15 is _rec_factory else _rec_a15
    self._rec_n16 = _rec_f16() if _rec_a16 is _rec_factory else _rec_a16
    self._rec_n17 = _rec_f17() if _rec_a17 is _rec_factory else _rec_a17
    self._rec_n18 = _rec_f18() if _rec_a18 is _rec_factory else _rec_a18
    self._rec_n19 = _rec_f19() if _rec_a19 is _rec_factory else _rec_a19
    self._rec_n20 = _rec_f20() if _rec_a20 is _rec_factory else _rec_a20
    self._rec_n21 = _rec_f21() if _rec_a21 is _rec_factory else _rec_a21
    self.__post_init__()


def init_22_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19, _rec_a20, _rec_a21):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)
    _rec_set(self, '_rec_n15', _rec_f15() if _rec_a15 is _rec_factory else _rec_a15)
    _rec_set(self, '_rec_n16', _rec_f16() if _rec_a16 is _rec_factory else _rec_a16)
    _rec_set(self, '_rec_n17', _rec_f17() if _rec_a17 is _rec_factory else _rec_a17)
    _rec_set(self, '_rec_n18', _rec_f18() if _rec_a18 is _rec_factory else _rec_a18)
    _rec_set(self, '_rec_n19', _rec_f19() if _rec_a19 is _rec_factory else _rec_a19)
    _rec_set(self, '_rec_n20', _rec_f20() if _rec_a20 is _rec_factory else _rec_a20)
    _rec_set(self, '_rec_n21', _rec_f21() if _rec_a21 is _rec_factory else _rec_a21)


def init_22_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19, _rec_a20, _rec_a21):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)
    _rec_set(self, '_rec_n15', _rec_f15() if _rec_a15 is _rec_factory else _rec_a15)
    _rec_set(self, '_rec_n16', _rec_f16() if _rec_a16 is _rec_factory else _rec_a16)
    _rec_set(self, '_rec_n17', _rec_f17() if _rec_a17 is _rec_factory else _rec_a17)
    _rec_set(self, '_rec_n18', _rec_f18() if _rec_a18 is _rec_factory else _rec_a18)
    _rec_set(self, '_rec_n19', _rec_f19() if _rec_a19 is _rec_factory else _rec_a19)
    _rec_set(self, '_rec_n20', _rec_f20() if _rec_a20 is _rec_factory else _rec_a20)
    _rec_set(self, '_rec_n21', _rec_f21() if _rec_a21 is _rec_factory else _rec_a21)
    self.__post_init__()


def init_23(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19, _rec_a20, _rec_a21, _rec_a22):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14
    self._rec_n15 = _rec_f15() if _rec_a15 is _rec_factory else _rec_a15
    self._rec_n16 = _rec_f16() if _rec_a16 is _rec_factory else _rec_a16
    self._rec_n17 = _rec_f17() if _rec_a17 is _rec_factory else _rec_a17
    self._rec_n18 = _rec_f18() if _rec_a18 is _rec_factory else _rec_a18
    self._rec_n19 = _rec_f19() if _rec_a19 is _rec_factory else _rec_a19
    self._rec_n20 = _rec_f20() if _rec_a20 is _rec_factory else _rec_a20
    self._rec_n21 = _rec_f21() if _rec_a21 is _rec_factory else _rec_a21
    self._rec_n22 = _rec_f22() if _rec_a22 is _rec_factory else _rec_a22


def init_23_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19, _rec_a20, _rec_a21, _rec_a22):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14
    self._rec_n15 = _rec_f15() if _rec_a15 is _rec_factory else _rec_a15
    self._rec_n16 = _rec_f16() if _rec_a16 is _rec_factory else _rec_a16
    self._rec_n17 = _rec_f17() if _rec_a17 is _rec_factory else _rec_a17
    self._rec_n18 = _rec_f18() if _rec_a18 is _rec_factory else _rec_a18
    self._rec_n19 = _rec_f19() if _rec_a19 is _rec_factory else _rec_a19
    self._rec_n20 = _rec_f20() if _rec_a20 is _rec_factory else _rec_a20
    self._rec_n21 = _rec_f21() if _rec_a21 is _rec_factory else _rec_a21
    self._rec_n22 = _rec_f22() if _rec_a22 is _rec_factory else _rec_a22
    self.__post_init__()


def init_23_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19, _rec_a20, _rec_a21, _rec_a22):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)
    _rec_set(self, '_rec_n15', _rec_f15() if _rec_a15 is _rec_factory else _rec_a15)
    _rec_set(self, '_rec_n16', _rec_f16() if _rec_a16 is _rec_factory else _rec_a16)
    _rec_set(self, '_rec_n17', _rec_f17() if _rec_a17 is _rec_factory else _rec_a17)
    _rec_set(self, '_rec_n18', _rec_f18() if _rec_a18 is _rec_factory else _rec_a18)
    _rec_set(self, '_rec_n19', _rec_f19() if _rec_a19 is _rec_factory else _rec_a19)
    _rec_set(self, '_rec_n20', _rec_f20() if _rec_a20 is _rec_factory else _rec_a20)
    _rec_set(self, '_rec_n21', _rec_f21() if _rec_a21 is _rec_factory else _rec_a21)
    _rec_set(self, '_rec_n22', _rec_f22() if _rec_a22 is _rec_factory else _rec_a22)


def init_23_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19, _rec_a20, _rec_a21, _rec_a22):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)
    _rec_set(self, '_rec_n15', _rec_f15() if _rec_a15 is _rec_factory else _rec_a15)
    _rec_set(self, '_rec_n16', _rec_f16() if _rec_a16 is _rec_factory else _rec_a16)
    _rec_set(self, '_rec_n17', _rec_f17() if _rec_a17 is _rec_factory else _rec_a17)
    _rec_set(self, '_rec_n18', _rec_f18() if _rec_a18 is _rec_factory else _rec_a18)
    _rec_set(self, '_rec_n19', _rec_f19() if _rec_a19 is _rec_factory else _rec_a19)
    _rec_set(self, '_rec_n20', _rec_f20() if _rec_a20 is _rec_factory else _rec_a20)
    _rec_set(self, '_rec_n21', _rec_f21() if _rec_a21 is _rec_factory else _rec_a21)
    _rec_set(self, '_rec_n22', _rec_f22() if _rec_a22 is _rec_factory else _rec_a22)
    self.__post_init__()


def init_24(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19, _rec_a20, _rec_a21, _rec_a22, _rec_a23):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14
    self._rec_n15 = _rec_f15() if _rec_a15 is _rec_factory else _rec_a15
    self._rec_n16 = _rec_f16() if _rec_a16 is _rec_factory else _rec_a16
    self._rec_n17 = _rec_f17() if _rec_a17 is _rec_factory else _rec_a17
    self._rec_n18 = _rec_f18() if _rec_a18 is _rec_factory else _rec_a18
    self._rec_n19 = _rec_f19() if _rec_a19 is _rec_factory else _rec_a19
    self._rec_n20 = _rec_f20() if _rec_a20 is _rec_factory else _rec_a20
    self._rec_n21 = _rec_f21() if _rec_a21 is _rec_factory else _rec_a21
    self._rec_n22 = _rec_f22() if _rec_a22 is _rec_factory else _rec_a22
    self._rec_n23 = _rec_f23() if _rec_a23 is _rec_factory else _rec_a23


def init_24_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19, _rec_a20, _rec_a21, _rec_a22, _rec_a23):
    self._rec_n0 = _rec_f0() if _rec_a0 is _rec_factory else _rec_a0
    self._rec_n1 = _rec_f1() if _rec_a1 is _rec_factory else _rec_a1
    self._rec_n2 = _rec_f2() if _rec_a2 is _rec_factory else _rec_a2
    self._rec_n3 = _rec_f3() if _rec_a3 is _rec_factory else _rec_a3
    self._rec_n4 = _rec_f4() if _rec_a4 is _rec_factory else _rec_a4
    self._rec_n5 = _rec_f5() if _rec_a5 is _rec_factory else _rec_a5
    self._rec_n6 = _rec_f6() if _rec_a6 is _rec_factory else _rec_a6
    self._rec_n7 = _rec_f7() if _rec_a7 is _rec_factory else _rec_a7
    self._rec_n8 = _rec_f8() if _rec_a8 is _rec_factory else _rec_a8
    self._rec_n9 = _rec_f9() if _rec_a9 is _rec_factory else _rec_a9
    self._rec_n10 = _rec_f10() if _rec_a10 is _rec_factory else _rec_a10
    self._rec_n11 = _rec_f11() if _rec_a11 is _rec_factory else _rec_a11
    self._rec_n12 = _rec_f12() if _rec_a12 is _rec_factory else _rec_a12
    self._rec_n13 = _rec_f13() if _rec_a13 is _rec_factory else _rec_a13
    self._rec_n14 = _rec_f14() if _rec_a14 is _rec_factory else _rec_a14
    self._rec_n15 = _rec_f15() if _rec_a15 is _rec_factory else _rec_a15
    self._rec_n16 = _rec_f16() if _rec_a16 is _rec_factory else _rec_a16
    self._rec_n17 = _rec_f17() if _rec_a17 is _rec_factory else _rec_a17
    self._rec_n18 = _rec_f18() if _rec_a18 is _rec_factory else _rec_a18
    self._rec_n19 = _rec_f19() if _rec_a19 is _rec_factory else _rec_a19
    self._rec_n20 = _rec_f20() if _rec_a20 is _rec_factory else _rec_a20
    self._rec_n21 = _rec_f21() if _rec_a21 is _rec_factory else _rec_a21
    self._rec_n22 = _rec_f22() if _rec_a22 is _rec_factory else _rec_a22
    self._rec_n23 = _rec_f23() if _rec_a23 is _rec_factory else _rec_a23
    self.__post_init__()


def init_24_frozen(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19, _rec_a20, _rec_a21, _rec_a22, _rec_a23):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)
    _rec_set(self, '_rec_n15', _rec_f15() if _rec_a15 is _rec_factory else _rec_a15)
    _rec_set(self, '_rec_n16', _rec_f16() if _rec_a16 is _rec_factory else _rec_a16)
    _rec_set(self, '_rec_n17', _rec_f17() if _rec_a17 is _rec_factory else _rec_a17)
    _rec_set(self, '_rec_n18', _rec_f18() if _rec_a18 is _rec_factory else _rec_a18)
    _rec_set(self, '_rec_n19', _rec_f19() if _rec_a19 is _rec_factory else _rec_a19)
    _rec_set(self, '_rec_n20', _rec_f20() if _rec_a20 is _rec_factory else _rec_a20)
    _rec_set(self, '_rec_n21', _rec_f21() if _rec_a21 is _rec_factory else _rec_a21)
    _rec_set(self, '_rec_n22', _rec_f22() if _rec_a22 is _rec_factory else _rec_a22)
    _rec_set(self, '_rec_n23', _rec_f23() if _rec_a23 is _rec_factory else _rec_a23)


def init_24_frozen_post(self, _rec_a0, _rec_a1, _rec_a2, _rec_a3, _rec_a4, _rec_a5, _rec_a6, _rec_a7, _rec_a8, _rec_a9, _rec_a10, _rec_a11, _rec_a12, _rec_a13, _rec_a14, _rec_a15, _rec_a16, _rec_a17, _rec_a18, _rec_a19, _rec_a20, _rec_a21, _rec_a22, _rec_a23):
    _rec_set(self, '_rec_n0', _rec_f0() if _rec_a0 is _rec_factory else _rec_a0)
    _rec_set(self, '_rec_n1', _rec_f1() if _rec_a1 is _rec_factory else _rec_a1)
    _rec_set(self, '_rec_n2', _rec_f2() if _rec_a2 is _rec_factory else _rec_a2)
    _rec_set(self, '_rec_n3', _rec_f3() if _rec_a3 is _rec_factory else _rec_a3)
    _rec_set(self, '_rec_n4', _rec_f4() if _rec_a4 is _rec_factory else _rec_a4)
    _rec_set(self, '_rec_n5', _rec_f5() if _rec_a5 is _rec_factory else _rec_a5)
    _rec_set(self, '_rec_n6', _rec_f6() if _rec_a6 is _rec_factory else _rec_a6)
    _rec_set(self, '_rec_n7', _rec_f7() if _rec_a7 is _rec_factory else _rec_a7)
    _rec_set(self, '_rec_n8', _rec_f8() if _rec_a8 is _rec_factory else _rec_a8)
    _rec_set(self, '_rec_n9', _rec_f9() if _rec_a9 is _rec_factory else _rec_a9)
    _rec_set(self, '_rec_n10', _rec_f10() if _rec_a10 is _rec_factory else _rec_a10)
    _rec_set(self, '_rec_n11', _rec_f11() if _rec_a11 is _rec_factory else _rec_a11)
    _rec_set(self, '_rec_n12', _rec_f12() if _rec_a12 is _rec_factory else _rec_a12)
    _rec_set(self, '_rec_n13', _rec_f13() if _rec_a13 is _rec_factory else _rec_a13)
    _rec_set(self, '_rec_n14', _rec_f14() if _rec_a14 is _rec_factory else _rec_a14)
    _rec_set(self, '_rec_n15', _rec_f15() if _rec_a15 is _rec_factory else _rec_a15)
    _rec_set(self, '_rec_n16', _rec_f16() if _rec_a16 is _rec_factory else _rec_a16)
    _rec_set(self, '_rec_n17', _rec_f17() if _rec_a17 is _rec_factory else _rec_a17)
    _rec_set(self, '_rec_n18', _rec_f18() if _rec_a18 is _rec_factory else _rec_a18)
    _rec_set(self, '_rec_n19', _rec_f19() if _rec_a19 is _rec_factory else _rec_a19)
    _rec_set(self, '_rec_n20', _rec_f20() if _rec_a20 is _rec_factory else _rec_a20)
    _rec_set(self, '_rec_n21', _rec_f21() if _rec_a21 is _rec_factory else _rec_a21)
    _rec_set(self, '_rec_n22', _rec_f22() if _rec_a22 is _rec_factory else _rec_a22)
    _rec_set(self, '_rec_n23', _rec_f23() if _rec_a23 is _rec_factory else _rec_a23)
    self.__post_init__()
